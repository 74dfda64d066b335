/*!
Method §6: displacement demand by the N2 method (EN 1998-1 Annex B) with an
inverted-triangle mode shape and equal floor masses.
*/

/// Mode shape Φ_i = z_i / H (inverted triangle), method §6.
pub fn mode_shape(z_m: &[f64]) -> Vec<f64> {
    let h = z_m.last().copied().unwrap_or(0.0);
    z_m.iter()
        .map(|z| if h > 0.0 { z / h } else { 0.0 })
        .collect()
}

/// Transformation factor Γ = Σm·Φ_i / Σm·Φ_i² with equal masses (EN 1998-1 eq. B.3);
/// equal storeys give 3n/(2n+1).
pub fn participation_factor(phi: &[f64]) -> f64 {
    let s1: f64 = phi.iter().sum();
    let s2: f64 = phi.iter().map(|p| p * p).sum();
    if s2 > 0.0 { s1 / s2 } else { 1.0 }
}

/// Yield acceleration of the equivalent SDOF system S_ay = F_y*/m* in g:
/// S_ay = C_y·n / (Γ·ΣΦ_i) (EN 1998-1 B.2–B.3 with F_y* = C_y·W/Γ, m* = m·ΣΦ_i).
pub fn yield_acceleration_g(cy: f64, n: u32, gamma: f64, phi: &[f64]) -> f64 {
    let sum: f64 = phi.iter().sum();
    let den = gamma * sum;
    if den > 0.0 {
        cy * f64::from(n) / den
    } else {
        0.0
    }
}

/// Strength ratio qu = Se(T*)/S_ay (EN 1998-1 B.5, both in g). `None` when S_ay ≤ 0.
pub fn strength_ratio(se_g: f64, say_g: f64) -> Option<f64> {
    (say_g > 0.0).then(|| se_g / say_g)
}

/// Branch of the N2 target displacement (EN 1998-1 B.5).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum N2Branch {
    /// T* ≥ TC or qu ≤ 1: dt* = det* (equal displacement).
    EqualDisplacement,
    /// T* < TC and qu > 1: short-period formula.
    ShortPeriod,
}

impl N2Branch {
    /// Name used in outputs.
    pub fn name(self) -> &'static str {
        match self {
            N2Branch::EqualDisplacement => "equal-displacement",
            N2Branch::ShortPeriod => "short-period",
        }
    }
}

/// Cap of the short-period target displacement: dt* ≤ 3·det* (EN 1998-1 Annex B, B.5).
pub const N2_CAP: f64 = 3.0;

/// SDOF target displacement dt* (m), EN 1998-1 eqs. (B.7)–(B.8):
/// T ≥ TC or qu ≤ 1 → det*; else (det*/qu)(1 + (qu−1)·TC/T), within [det*, 3·det*].
/// `qu = None` (no strength, S_ay = 0: qu unbounded) takes the formula's limit as qu → ∞,
/// det*·TC/T, within the same clamp (method §6; before the audit it took 3·det* outright).
pub fn target_displacement_m(det_m: f64, qu: Option<f64>, t: f64, tc: f64) -> (f64, N2Branch) {
    match qu {
        Some(q) if t >= tc || q <= 1.0 => (det_m, N2Branch::EqualDisplacement),
        Some(q) if t > 0.0 => {
            let dt = det_m / q * (1.0 + (q - 1.0) * tc / t);
            (dt.clamp(det_m, N2_CAP * det_m), N2Branch::ShortPeriod)
        }
        None if t >= tc => (det_m, N2Branch::EqualDisplacement),
        None if t > 0.0 => {
            let dt = det_m * tc / t;
            (dt.clamp(det_m, N2_CAP * det_m), N2Branch::ShortPeriod)
        }
        _ => (N2_CAP * det_m, N2Branch::ShortPeriod),
    }
}

/// Roof displacement d_t = Γ·dt* (m), EN 1998-1 eq. (B.13).
pub fn roof_displacement_m(gamma: f64, dt_star_m: f64) -> f64 {
    gamma * dt_star_m
}

/// Roof drift ratio δ_r = d_t / H (method §6).
pub fn roof_drift(roof_displacement_m: f64, height_m: f64) -> f64 {
    if height_m > 0.0 {
        roof_displacement_m / height_m
    } else {
        0.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn gamma_equal_storeys() {
        let phi = mode_shape(&[3.0, 6.0, 9.0]);
        assert!((participation_factor(&phi) - 9.0 / 7.0).abs() < 1e-12);
    }
}
