/*!
Every coefficient, threshold and default of the screening method, in one struct.

Each key carries a source tag, echoed on the workbook's Assumptions sheet:
`[src]` a published source named in the doc, `[mem]` recalled from memory (verify before
relying on it), `[practice]` common practice with no single source, `[screening]` an
assumption of this method stated openly, `[project]` a choice of this tool (no engineering
meaning). Precedence when loading: built-in defaults < inventory `settings` sheet <
`--settings` TOML file < command-line flags.

The key names of `interface.md` are fixed; keys the project adds are documented in
`templates/settings.toml`, which a test keeps in step with [`KEYS`].
*/

use serde::{Deserialize, Serialize};
use std::fmt;

/// Errors raised while loading or applying settings.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum SettingsError {
    /// A key that the settings table does not hold.
    #[error("unknown settings key `{0}`{hint}", hint = nearest_hint(.0))]
    UnknownKey(String),
    /// Keys of one file that the settings table does not hold, all at once.
    #[error("unknown settings keys: {}", .0.iter().map(|k| format!("`{k}`{}", nearest_hint(k))).collect::<Vec<_>>().join(", "))]
    UnknownKeys(Vec<String>),
    /// A value that cannot be read for its key.
    #[error("settings key `{key}`: expected {expected}, found `{found}`")]
    BadValue {
        /// The key.
        key: String,
        /// What the key accepts.
        expected: &'static str,
        /// The text that was given.
        found: String,
    },
    /// A TOML file that does not parse.
    #[error("settings file: {0}")]
    Toml(String),
    /// A value that parses but is outside its allowed range.
    #[error("settings key `{key}`: {message}")]
    OutOfRange {
        /// The key.
        key: String,
        /// Why it is refused.
        message: String,
    },
}

/// One unit-mistake check of a settings default: (key, value, what, unit, range, likely
/// slips as (unit, multiplier, divisor)).
type LimitCheck = (
    &'static str,
    f64,
    &'static str,
    &'static str,
    (f64, f64),
    &'static [(&'static str, f64, f64)],
);

/// Ground type of EN 1998-1 Table 3.1.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Deserialize)]
pub enum GroundType {
    /// Rock.
    A,
    /// Very dense sand/gravel or very stiff clay.
    B,
    /// Dense or medium-dense sand/gravel or stiff clay.
    C,
    /// Loose-to-medium cohesionless soil or soft-to-firm cohesive soil.
    D,
    /// Surface alluvium layer over stiffer material.
    E,
}

/// Spectrum family (method §5).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum Spectrum {
    /// EN 1998-1 Type 1 (Table 3.2).
    #[serde(rename = "ec8-type1")]
    Ec8Type1,
    /// EN 1998-1 Type 2 (Table 3.3).
    #[serde(rename = "ec8-type2")]
    Ec8Type2,
    /// ASCE 7-16 §11.4.6 two-parameter shape.
    #[serde(rename = "two-parameter")]
    TwoParameter,
}

/// Chord-rotation capacity model for walls (method §8).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum CapacityModel {
    /// EN 1998-3 Annex A.
    #[serde(rename = "eurocode")]
    Eurocode,
    /// ASCE 41-17 Table 10-19.
    #[serde(rename = "asce41")]
    Asce41,
    /// The lower of the two at every level.
    #[serde(rename = "lower-of-both")]
    LowerOfBoth,
}

/// Performance level.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Deserialize)]
pub enum Level {
    /// Immediate Occupancy (EN 1998-3 DL).
    #[serde(rename = "io")]
    Io,
    /// Life Safety (EN 1998-3 SD).
    #[serde(rename = "ls")]
    Ls,
    /// Collapse Prevention (EN 1998-3 NC).
    #[serde(rename = "cp")]
    Cp,
}

impl Level {
    /// All three levels, from the least to the most severe damage state.
    pub const ALL: [Level; 3] = [Level::Io, Level::Ls, Level::Cp];
    /// The short lower-case code (`io`, `ls`, `cp`).
    pub fn code(self) -> &'static str {
        match self {
            Level::Io => "io",
            Level::Ls => "ls",
            Level::Cp => "cp",
        }
    }
}

/// One row of the construction-era table: default material strengths by year built.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Era {
    /// First year of the era (inclusive); empty = open.
    #[serde(default)]
    pub from_year: Option<i32>,
    /// Last year of the era (inclusive); empty = open.
    #[serde(default)]
    pub to_year: Option<i32>,
    /// Concrete strength (MPa).
    #[serde(default)]
    pub fc_mpa: Option<f64>,
    /// Steel yield strength (MPa).
    #[serde(default)]
    pub fy_mpa: Option<f64>,
}

/// A value type that a settings key can hold, read from text (TOML scalar or sheet cell).
pub trait SettingValue: Sized {
    /// What the key accepts, for messages.
    const EXPECTED: &'static str;
    /// Reads the value from text; `None` when the text is not acceptable.
    fn parse_text(text: &str) -> Option<Self>;
    /// The value as text (empty for an empty optional value).
    fn to_text(&self) -> String;
}

/// A settings number: the inventory's survey-number reader
/// ([`crate::input::parse::survey_number`]) — the same rules in the TOML file, the
/// settings sheet and the cells — taking only a reading that needs no check: a unit after
/// the number and an ambiguous "1,200" are settled by [`Settings::set_from_text_noted`].
fn parse_number(text: &str) -> Option<f64> {
    let n = crate::input::parse::survey_number(text, false, false).ok()?;
    (n.unit.is_none() && n.alternative.is_none()).then_some(n.value)
}

/// Settings keys renamed by a revision of the contract: (old key, new key, how an old
/// value becomes a new one). An old key is accepted with a warning naming the new one.
pub const RENAMED_KEYS: &[(&str, &str, Rename)] = &[(
    "wall_capacity_factor",
    "wall_rotation_divisor",
    Rename::Reciprocal,
)];

/// How the value of a renamed key carries over.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Rename {
    /// The same value under the new name.
    Same,
    /// The new key divides where the old one multiplied: new = 1 / old (revision 6,
    /// method §8: the wall rotation factor 0.58 became the divisor 1.6 of EN 1998-3
    /// §A.3.2.2(2)).
    Reciprocal,
}

/// The nearest known key to an unknown one (Jaro–Winkler similarity of `strsim`, at least
/// 0.8), or a renamed key's new name.
pub fn nearest_key(key: &str) -> Option<&'static str> {
    if let Some((_, new, _)) = RENAMED_KEYS.iter().find(|(old, _, _)| *old == key) {
        return Some(new);
    }
    KEYS.iter()
        .map(|k| (k.key, strsim::jaro_winkler(key, k.key)))
        .chain(std::iter::once(("era", strsim::jaro_winkler(key, "era"))))
        .filter(|(_, s)| *s >= 0.8)
        .max_by(|a, b| a.1.total_cmp(&b.1))
        .map(|(k, _)| k)
}

fn nearest_hint(key: &str) -> String {
    nearest_key(key).map_or_else(String::new, |k| format!(" (did you mean `{k}`?)"))
}

impl SettingValue for f64 {
    const EXPECTED: &'static str = "a number";
    fn parse_text(text: &str) -> Option<Self> {
        parse_number(text)
    }
    fn to_text(&self) -> String {
        format!("{self}")
    }
}

impl SettingValue for Option<f64> {
    const EXPECTED: &'static str = "a number or empty";
    fn parse_text(text: &str) -> Option<Self> {
        if text.trim().is_empty() {
            Some(None)
        } else {
            parse_number(text).map(Some)
        }
    }
    fn to_text(&self) -> String {
        self.map(|v| format!("{v}")).unwrap_or_default()
    }
}

impl SettingValue for Option<i32> {
    const EXPECTED: &'static str = "a year or empty";
    fn parse_text(text: &str) -> Option<Self> {
        if text.trim().is_empty() {
            return Some(None);
        }
        let v = parse_number(text)?;
        (v.fract() == 0.0 && v.abs() < 1.0e6).then_some(Some(v as i32))
    }
    fn to_text(&self) -> String {
        self.map(|v| v.to_string()).unwrap_or_default()
    }
}

/// An unsigned integer setting: digits only (an integral number such as `200.0`, as a
/// spreadsheet cell may hold it, is accepted up to 2^53); negative values are refused.
fn parse_unsigned(text: &str) -> Option<u64> {
    let t = text.trim().replace('_', "");
    if let Ok(v) = t.parse::<u64>() {
        return Some(v);
    }
    let v = parse_number(&t)?;
    (v >= 0.0 && v.fract() == 0.0 && v <= 9_007_199_254_740_992.0).then_some(v as u64)
}

impl SettingValue for u64 {
    const EXPECTED: &'static str = "an unsigned 64-bit integer (0 to 18446744073709551615)";
    fn parse_text(text: &str) -> Option<Self> {
        parse_unsigned(text)
    }
    fn to_text(&self) -> String {
        self.to_string()
    }
}

impl SettingValue for u32 {
    const EXPECTED: &'static str = "a whole number from 0 to 4294967295";
    fn parse_text(text: &str) -> Option<Self> {
        parse_unsigned(text).and_then(|v| u32::try_from(v).ok())
    }
    fn to_text(&self) -> String {
        self.to_string()
    }
}

impl SettingValue for Option<u64> {
    const EXPECTED: &'static str = "a whole number of at least 1, or empty";
    fn parse_text(text: &str) -> Option<Self> {
        if text.trim().is_empty() {
            return Some(None);
        }
        parse_unsigned(text).map(Some)
    }
    fn to_text(&self) -> String {
        self.map(|v| v.to_string()).unwrap_or_default()
    }
}

macro_rules! text_enum {
    ($ty:ty, $expected:literal, $( $text:literal => $variant:expr ),* $(,)?) => {
        impl SettingValue for $ty {
            const EXPECTED: &'static str = $expected;
            fn parse_text(text: &str) -> Option<Self> {
                let t = text.trim().to_ascii_lowercase();
                match t.as_str() {
                    $( $text => Some($variant), )*
                    _ => None,
                }
            }
            fn to_text(&self) -> String {
                $( if *self == $variant { return $text.to_ascii_uppercase_if_ground(); } )*
                String::new()
            }
        }
    };
}

trait GroundCase {
    fn to_ascii_uppercase_if_ground(&self) -> String;
}
impl GroundCase for &str {
    fn to_ascii_uppercase_if_ground(&self) -> String {
        if self.len() == 1 {
            self.to_ascii_uppercase()
        } else {
            (*self).to_string()
        }
    }
}

text_enum!(GroundType, "one of A, B, C, D, E",
    "a" => GroundType::A, "b" => GroundType::B, "c" => GroundType::C,
    "d" => GroundType::D, "e" => GroundType::E);
text_enum!(Spectrum, "one of ec8-type1, ec8-type2, two-parameter",
    "ec8-type1" => Spectrum::Ec8Type1, "ec8-type2" => Spectrum::Ec8Type2,
    "two-parameter" => Spectrum::TwoParameter);
text_enum!(CapacityModel, "one of eurocode, asce41, lower-of-both",
    "eurocode" => CapacityModel::Eurocode, "asce41" => CapacityModel::Asce41,
    "lower-of-both" => CapacityModel::LowerOfBoth);
text_enum!(Level, "one of io, ls, cp", "io" => Level::Io, "ls" => Level::Ls, "cp" => Level::Cp);

impl fmt::Display for GroundType {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.to_text())
    }
}
impl fmt::Display for Level {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.code())
    }
}

/// Description of one settings key: its name, source tag and meaning.
#[derive(Debug, Clone, Copy)]
pub struct KeyInfo {
    /// The key, as in the TOML file and the settings sheet.
    pub key: &'static str,
    /// The source tag (`[src] …`, `[mem] …`, `[practice]`, `[screening]`, `[project]`).
    pub tag: &'static str,
    /// What the key means, with its unit.
    pub doc: &'static str,
}

macro_rules! settings_table {
    ($( $key:ident : $ty:ty = $default:expr ; $tag:literal ; $doc:literal ; )*) => {
        /// Every coefficient, threshold and default of `method.md`, with its source tag
        /// in [`KEYS`]. Field names are the fixed settings keys of `interface.md`.
        #[derive(Debug, Clone, PartialEq, Serialize)]
        pub struct Settings {
            $( #[doc = $doc] #[doc = ""] #[doc = $tag] pub $key: $ty, )*
            /// Construction-era table (TOML only): default fc / fy by year built. Empty by
            /// default [screening]: the local code history decides it.
            pub era: Vec<Era>,
        }

        impl Default for Settings {
            fn default() -> Self {
                Self { $( $key: $default, )* era: Vec::new() }
            }
        }

        /// Every scalar settings key with its source tag and meaning, in table order.
        pub const KEYS: &[KeyInfo] = &[ $( KeyInfo { key: stringify!($key), tag: $tag, doc: $doc }, )* ];

        impl Settings {
            /// Sets one scalar key from text (a settings-sheet cell or a TOML scalar).
            pub fn set_from_text(&mut self, key: &str, text: &str) -> Result<(), SettingsError> {
                match key {
                    $( stringify!($key) => {
                        self.$key = <$ty as SettingValue>::parse_text(text).ok_or_else(|| SettingsError::BadValue {
                            key: key.to_string(),
                            expected: <$ty as SettingValue>::EXPECTED,
                            found: text.to_string(),
                        })?;
                        Ok(())
                    } )*
                    _ => Err(SettingsError::UnknownKey(key.to_string())),
                }
            }

            /// The effective value of one scalar key as text (empty when unset).
            pub fn value_text(&self, key: &str) -> Option<String> {
                match key {
                    $( stringify!($key) => Some(SettingValue::to_text(&self.$key)), )*
                    _ => None,
                }
            }
        }
    };
}

settings_table! {
    // ---- hazard (method §5) ----
    agr_g: Option<f64> = None; "[screening] no built-in default: hazard is site-specific";
        "Reference peak ground acceleration on rock agR (g).";
    default_ground_type: GroundType = GroundType::C; "[screening]";
        "Ground type (EN 1998-1 Table 3.1, A-E) used when neither row nor district gives one.";
    spectrum: Spectrum = Spectrum::Ec8Type1; "[src] EN 1998-1 §3.2.2.2; ASCE 7-16 §11.4.6";
        "Spectrum family: ec8-type1, ec8-type2 or two-parameter.";
    sds_g: Option<f64> = None; "[src] ASCE 7-16 §11.4.6";
        "Two-parameter spectrum: short-period design acceleration SDS (g).";
    sd1_g: Option<f64> = None; "[src] ASCE 7-16 §11.4.6";
        "Two-parameter spectrum: 1-second design acceleration SD1 (g).";
    tl_s: Option<f64> = None; "[src] ASCE 7-16 §11.4.6";
        "Two-parameter spectrum: long-period corner TL (s); empty = no corner.";
    damping_pct: f64 = 5.0; "[src] EN 1998-1 §3.2.2.2(3)";
        "Viscous damping ratio xi (%) for eta = sqrt(10/(5+xi)) >= 0.55.";
    eta_min: f64 = 0.55; "[src] EN 1998-1 eq. (3.6)";
        "Lower bound of the damping correction factor eta.";
    gamma_i_residential: f64 = 1.0; "[mem-H] EN 1998-1:2004 §4.2.5(5)P and Table 4.3: ordinary buildings are importance class II, whose gamma_I is 1.0 by definition: not verified against the source: recalled from memory; check before relying on it";
        "Importance factor gamma_I for residential use.";
    gamma_i_office: f64 = 1.0; "[mem-H] EN 1998-1:2004 §4.2.5(5)P and Table 4.3: ordinary buildings are importance class II, whose gamma_I is 1.0 by definition: not verified against the source: recalled from memory; check before relying on it";
        "Importance factor gamma_I for office use.";
    gamma_i_school: f64 = 1.2; "[mem-H] EN 1998-1:2004 Table 4.3 (schools: class III) and the note to §4.2.5(5)P (recommended 1.2): not verified against the source: recalled from memory; check before relying on it";
        "Importance factor gamma_I for schools.";
    gamma_i_hospital: f64 = 1.4; "[mem-H] EN 1998-1:2004 Table 4.3 (hospitals: class IV) and the note to §4.2.5(5)P (recommended 1.4): not verified against the source: recalled from memory; check before relying on it";
        "Importance factor gamma_I for hospitals.";
    gamma_i_other: f64 = 1.0; "[mem-H] EN 1998-1:2004 §4.2.5(5)P and Table 4.3: ordinary buildings are importance class II, whose gamma_I is 1.0 by definition: not verified against the source: recalled from memory; check before relying on it";
        "Importance factor gamma_I for other uses.";
    near_fault_km: f64 = 10.0; "[screening]";
        "Distance (km) within which a fault trace without magnitude flags near-fault.";
    near_fault_mw_large: f64 = 7.0; "[mem-H] ASCE 7-16 §11.4.1 (near-fault site: within 15 km of a fault able to produce Mw 7, 10 km of Mw 6): not verified against the source: recalled from memory; check before relying on it";
        "Magnitude from which the large near-fault distance applies.";
    near_fault_km_large: f64 = 15.0; "[mem-H] ASCE 7-16 §11.4.1: not verified against the source: recalled from memory; check before relying on it";
        "Near-fault distance (km) for traces with Mw >= near_fault_mw_large.";
    near_fault_mw_small: f64 = 6.0; "[mem-H] ASCE 7-16 §11.4.1: not verified against the source: recalled from memory; check before relying on it";
        "Magnitude below which a trace never flags near-fault.";
    near_fault_km_small: f64 = 10.0; "[mem-H] ASCE 7-16 §11.4.1: not verified against the source: recalled from memory; check before relying on it";
        "Near-fault distance (km) for traces with near_fault_mw_small <= Mw < near_fault_mw_large.";
    near_fault_demand_factor: f64 = 1.0; "[screening] off (1.0) by default";
        "Factor on the spectrum for buildings flagged near-fault (1.0 = no change).";
    // ---- building defaults (method §0) ----
    floor_weight_kpa: f64 = 12.0; "[practice] 10-14 kPa for RC buildings with infill: common practice, no single source; recalled from memory, check before relying on it";
        "Seismic weight per unit floor area w (kPa).";
    default_storey_height_m: f64 = 3.0; "[practice]";
        "Typical storey height when the row gives none (m).";
    default_wall_length_m: f64 = 4.0; "[screening]";
        "Representative RC wall length lw when the row gives none (m).";
    default_wall_thickness_m: f64 = 0.25; "[screening]";
        "RC wall thickness tw when the row gives none (m).";
    default_column_depth_m: f64 = 0.40; "[screening]";
        "Square column depth h_c when the row gives none (m).";
    default_fc_mpa: f64 = 20.0; "[screening]";
        "Concrete strength fc when neither row nor era table gives one (MPa).";
    default_fy_mpa: f64 = 420.0; "[screening]";
        "Steel yield strength fy when neither row nor era table gives one (MPa).";
    default_bar_diameter_m: f64 = 0.016; "[screening]";
        "Longitudinal bar diameter db (m).";
    boundary_steel_pct: f64 = 1.0; "[screening]";
        "Wall boundary (tension = compression) steel ratio (%).";
    web_steel_pct: f64 = 0.25; "[src] ACI 318-19 §18.10.2.1 minimum";
        "Wall web vertical steel ratio rho_v (%), used in the boundary-element check.";
    column_steel_pct: f64 = 1.0; "[screening]";
        "Column longitudinal steel ratio rho_l (%); omega = omega' = 0.5 rho_l fy / fc.";
    es_mpa: f64 = 200000.0; "[src] EN 1992-1-1 §3.2.7(4)";
        "Steel modulus Es (MPa).";
    confidence_factor: f64 = 1.0; "[mem-H] EN 1998-3:2005 §3.3 and Table 3.1 (KL1 1.35, KL2 1.20, KL3 1.00; the values are nationally determined, these the recommended ones): not verified against the source: recalled from memory; check before relying on it";
        "Confidence factor CF dividing mean strengths of existing members in §8.";
    boundary_elements_from_year: Option<i32> = None; "[screening] empty: local code history decides";
        "Year from which walls recorded 'unknown' are taken to have boundary elements.";
    seismic_detailing_from_year: Option<i32> = None; "[screening] empty: local code history decides";
        "Year from which columns are taken to be seismically detailed.";
    // ---- indices and strength (method §1-§3) ----
    infill_weight: f64 = 0.1; "[src] Hassan & Sozen 1997, ACI Structural Journal 94(1), wall index: infill counted at 1/10 of its area; the 1/10 is not verified against the source: recalled from memory; check before relying on it";
        "Weight of masonry infill area relative to RC wall area (§1, §3, §10).";
    pi_threshold_pct: Option<f64> = None; "[screening] no published cut-off built in";
        "Priority index (%) below which low-priority-index is flagged; empty = no flag.";
    tau_wall_mpa: f64 = 2.0; "[mem] JBDPA 2001 Standard for Seismic Evaluation of Existing RC Buildings, first-level screening: 2.0 N/mm2 for walls with a column at one end (3.0 with columns at both ends, 1.0 with none): not verified against the source: recalled from memory; check before relying on it";
        "Average shear strength of RC walls tau_w (MPa).";
    tau_column_mpa: f64 = 1.0; "[mem] JBDPA 2001 first-level screening: 1.0 N/mm2 for columns with 2 < h0/D <= 6 (0.7 above 6; 1.5 for extremely short columns): not verified against the source: recalled from memory; check before relying on it";
        "Average shear strength of columns tau_c (MPa).";
    fc_reference_mpa: f64 = 20.0; "[mem] JBDPA 2001 first-level screening, strength factor beta = fc/20 up to 20 MPa, sqrt(fc/20) above: not verified against the source: recalled from memory; check before relying on it";
        "Reference concrete strength of the strength factor beta (MPa).";
    alpha1_with_walls: f64 = 0.7; "[mem] JBDPA 2001 first-level screening, E0 = (Cw + 0.7 Cc)·F for wall-governed buildings (columns short of their strength at the walls' ultimate drift): not verified against the source: recalled from memory; check before relying on it";
        "Column participation alpha1 in the wall-governed strength: C_y = C_m + max(C_rc + alpha1 C_c, C_c).";
    // ---- period (method §4) ----
    ct_period: f64 = 0.075; "[src] EN 1998-1 eqs. (4.6)/(4.7)";
        "Period coefficient Ct (s/m^0.75).";
    period_factor: f64 = 1.0; "[screening] 1.0 = the code formula; cracked-stiffness practice of 1.3-1.5 is recalled from memory, check before relying on it";
        "Factor on the formula period.";
    period_height_limit_m: f64 = 40.0; "[src] EN 1998-1 §4.3.3.2.2(3)";
        "Height above which the period formula is outside its range (flag period-range).";
    // ---- drift demand (method §7) ----
    kappa_frame: f64 = 1.5; "[practice] common practice, no single source; recalled from memory, check before relying on it";
        "Storey-drift concentration factor for a bare frame.";
    kappa_wall: f64 = 1.2; "[practice] common practice, no single source; recalled from memory, check before relying on it";
        "Storey-drift concentration factor for a wall-dominated building.";
    kappa_soft: f64 = 2.5; "[screening]";
        "Storey-drift concentration factor with a soft or weak storey.";
    kappa_wall_index_pct: f64 = 0.5; "[screening]";
        "RC wall index (%) at which kappa reaches kappa_wall.";
    // ---- capacity (method §8) ----
    gamma_el: f64 = 1.5; "[src] EN 1998-3 §A.3.2.2(1)";
        "gamma_el for primary seismic elements in eq. (A.1).";
    wall_rotation_divisor: f64 = 1.6; "[src] EN 1998-3:2005 §A.3.2.2(2), walls: the value of eq. (A.1) divided by 1.6 (the 0.58 of later papers is not the standard's); wording and paragraph number not verified against the source: recalled from memory; check before relying on it";
        "Divisor on theta_um of eq. (A.1) for walls (the 0.58 of later papers is not the standard's).";
    no_detailing_divisor: f64 = 1.2; "[mem] EN 1998-3:2005 §A.3.2.2(2), members without seismic detailing: not verified against the source: recalled from memory; check before relying on it";
        "Divisor on theta_um for members without seismic detailing.";
    confined_alpha: f64 = 0.5; "[screening]";
        "Confinement effectiveness alpha with boundary elements / seismic detailing.";
    confined_rho_sx_pct: f64 = 0.6; "[screening]";
        "Transverse steel ratio rho_sx (%) with boundary elements / seismic detailing.";
    unconfined_alpha: f64 = 0.2; "[screening]";
        "Confinement effectiveness alpha without detailing.";
    unconfined_rho_sx_pct: f64 = 0.1; "[screening]";
        "Transverse steel ratio rho_sx (%) without detailing.";
    ls_fraction_of_cp: f64 = 0.75; "[src] EN 1998-3 §A.3.2.3 (SD = 3/4 NC)";
        "Life Safety (SD) rotation as a fraction of the CP (NC) rotation.";
    phi_y_wall: f64 = 2.0; "[src] Priestley, Calvi & Kowalsky 2007";
        "Yield curvature coefficient of walls: phi_y = c eps_y / lw.";
    phi_y_column: f64 = 2.1; "[src] Priestley, Calvi & Kowalsky 2007";
        "Yield curvature coefficient of columns: phi_y = c eps_y / h.";
    // ---- flags (method §10) ----
    soft_ratio: f64 = 0.70; "[src] ASCE 7-16 Table 12.3-2 type 1a";
        "Soft storey: k1 below this fraction of k2.";
    soft_ratio_mean: f64 = 0.80; "[src] ASCE 7-16 Table 12.3-2 type 1a";
        "Soft storey: k1 below this fraction of the mean of the three storeys above.";
    extreme_soft_ratio: f64 = 0.60; "[src] ASCE 7-16 Table 12.3-2 type 1b";
        "Extreme soft storey: k1 below this fraction of k2.";
    extreme_soft_ratio_mean: f64 = 0.70; "[src] ASCE 7-16 Table 12.3-2 type 1b";
        "Extreme soft storey: k1 below this fraction of the mean of the three storeys above.";
    weak_ratio: f64 = 0.80; "[src] ASCE 7-16 Table 12.3-2 type 5a";
        "Weak storey: ground-storey strength below this fraction of the storey above.";
    high_axial_wall: f64 = 0.40; "[mem-H] EN 1998-1:2004 §5.4.3.4.1(2), DCM walls nu_d <= 0.4: not verified against the source: recalled from memory; check before relying on it";
        "Axial load ratio above which walls are flagged high-axial-wall.";
    high_axial_column: f64 = 0.65; "[mem-H] EN 1998-1:2004 §5.4.3.2.1(3)P, DCM columns nu_d <= 0.65: not verified against the source: recalled from memory; check before relying on it";
        "Axial load ratio above which columns are flagged high-axial-column.";
    slender_wall_ratio: f64 = 12.0; "[practice]";
        "H/lw above which a wall is flagged slender-wall.";
    squat_wall_ratio: f64 = 1.5; "[practice]";
        "Lv/lw below which a wall is flagged squat-wall.";
    torsion_eccentricity_ratio: f64 = 0.30; "[src] EN 1998-1 §4.2.3.2(6) eq. (4.1a)";
        "Torsion: e0 must not exceed this fraction of the torsional radius.";
    boundary_drift_floor: f64 = 0.005; "[src] ACI 318-19 §18.10.6.2(a)";
        "Lower bound of delta_u/hw in the boundary-element displacement check.";
    boundary_aspect_min: f64 = 2.0; "[src] ACI 318-19 §18.10.6.2";
        "hw/lw from which the displacement-based boundary-element check applies.";
    calibration_axial_max: f64 = 0.5; "[practice]";
        "Axial load ratio above which capacity equations are extrapolated.";
    calibration_steel_min_pct: f64 = 0.5; "[practice]";
        "Lower bound of the calibrated boundary steel ratio (%).";
    calibration_steel_max_pct: f64 = 4.0; "[practice]";
        "Upper bound of the calibrated boundary steel ratio (%).";
    calibration_shear_span_min: f64 = 1.0; "[practice]";
        "Lower bound of the calibrated shear-span ratio Lv/h.";
    calibration_shear_span_max: f64 = 8.0; "[practice]";
        "Upper bound of the calibrated shear-span ratio Lv/h.";
    wall_area_mismatch_pct: f64 = 5.0; "[project]";
        "Difference (%) between listed walls and rc_wall_area_*, and between a storeys-sheet row for storey 1 and the buildings row (method §10), above which a warning is given.";
    // ---- capacity model choice and ranking (method §8, §11) ----
    capacity_model: CapacityModel = CapacityModel::Eurocode; "[project]";
        "Wall capacity model: eurocode, asce41 or lower-of-both.";
    ranking_level: Level = Level::Ls; "[screening]";
        "Performance level whose governing DCR is the score: io, ls or cp.";
    // ---- retrofit and budget (method §12) ----
    retrofit_target_dcr: f64 = 1.0; "[screening]";
        "DCR_LS the wall retrofit must reach in each direction.";
    max_added_wall_index_pct: f64 = 1.5; "[screening]";
        "Cap on added RC wall area as a percentage of total floor area.";
    min_new_wall_index_pct: f64 = 0.2; "[screening]";
        "Added wall index (%) from which new walls govern the deformed shape (graded kappa).";
    new_wall_fc_mpa: f64 = 30.0; "[screening]";
        "Concrete strength of new walls (MPa).";
    new_wall_fy_mpa: f64 = 420.0; "[screening]";
        "Steel yield strength of new walls (MPa).";
    new_wall_thickness_m: f64 = 0.25; "[screening]";
        "Thickness of new walls (m).";
    new_wall_length_m: f64 = 5.0; "[screening]";
        "Length of each new wall (m).";
    new_wall_axial_ratio: f64 = 0.05; "[screening]";
        "Axial load ratio of new walls (they carry little gravity load).";
    bisection_tolerance_pct_of_cap: f64 = 0.5; "[screening]";
        "Bisection tolerance as a percentage of the cap (at least bisection_tolerance_m2).";
    bisection_tolerance_m2: f64 = 0.01; "[screening]";
        "Smallest bisection tolerance (m2).";
    unit_cost_wall_m3: Option<f64> = None; "[project] no default: prices are local";
        "Cost of new RC wall per m3 (currency-neutral).";
    unit_cost_floor_m2: Option<f64> = None; "[project] no default: prices are local";
        "Cost of finishes and foundations per m2 of floor area (currency-neutral).";
    replacement_cost_m2: Option<f64> = None; "[project] no default: prices are local";
        "Replacement cost per m2 of floor area (currency-neutral).";
    unit_cost_short_column_m2: Option<f64> = None; "[project] no default: prices are local";
        "Captive-column remedy per m2 of ground-storey plan A_plan (currency-neutral); empty = such buildings are not costed.";
    replace_ratio: f64 = 0.40; "[practice] common practice, no single source; recalled from memory, check before relying on it";
        "Recommend replacement when retrofit cost exceeds this fraction of replacement cost.";
    budget: Option<f64> = None; "[project]";
        "Budget for the funding plan (currency-neutral); empty = no plan.";
    knapsack_resolution: f64 = 2000.0; "[project]";
        "Number of cost steps of the knapsack (cost step = budget / this).";
    changes_rank_threshold: f64 = 10.0; "[project] interface.md";
        "Changes sheet (--previous): rank moves of more than this many places are listed.";
    // ---- uncertainty and rank robustness (method §13) ----
    samples: u32 = 0; "[project] method §13: 0 skips the stage";
        "Number of samples N of the uncertainty stage (--samples); 0 = no sampling.";
    seed: u64 = 1; "[project] method §13";
        "Seed S of the portable draws (unsigned 64-bit integer; --seed).";
    top_k: Option<u64> = None; "[screening] method §13: empty = the priority walk's funded count, else the class 1-2 count (at least 1)";
        "k of p_top_k, the share of samples with rank <= k.";
    beta_demand: f64 = 0.35; "[mem] record-to-record dispersion of inelastic displacement, 0.3-0.4";
        "Lognormal dispersion of the demand factor D on d_t (method §13).";
    beta_capacity: f64 = 0.40; "[mem] scatter of EN 1998-3 eq. (A.1) against tests, CoV about 0.4-0.5";
        "Lognormal dispersion of the capacity factors Cw, Cc on theta IO/LS/CP (method §13).";
    beta_fc_given: f64 = 0.20; "[practice]";
        "Lognormal dispersion of the concrete factor F when fc_mpa was given (method §13).";
    beta_fc_default: f64 = 0.35; "[practice]";
        "Lognormal dispersion of the concrete factor F when fc was defaulted (method §13).";
    beta_weight_given: f64 = 0.10; "[practice]";
        "Lognormal dispersion of the weight factor W when floor_weight_kpa was given (method §13).";
    beta_weight_default: f64 = 0.20; "[practice]";
        "Lognormal dispersion of the weight factor W when w was defaulted (method §13).";
    beta_hazard: f64 = 0.0; "[screening] the code spectrum is the scenario; set it to express hazard uncertainty";
        "Lognormal dispersion of the hazard factor H on agR or SDS/SD1, one draw per district (method §13).";
    // ---- input plausibility (inventory.md) ----
    max_storeys: f64 = 60.0; "[project] inventory.md";
        "Storey count above which a row is refused as implausible.";
    storey_height_min_m: f64 = 2.2; "[project] inventory.md";
        "Storey height below which a warning is given (m).";
    storey_height_max_m: f64 = 6.0; "[project] inventory.md";
        "Storey height above which a warning is given (m).";
    floor_weight_min_kpa: f64 = 6.0; "[project] inventory.md";
        "Floor weight below which a warning is given (kPa).";
    floor_weight_max_kpa: f64 = 20.0; "[project] inventory.md";
        "Floor weight above which a warning is given (kPa).";
}

impl Settings {
    /// Applies the rows of an inventory's `settings` sheet (key, value) in order.
    pub fn apply_pairs<'a>(
        &mut self,
        pairs: impl IntoIterator<Item = (&'a str, &'a str)>,
    ) -> Vec<SettingsError> {
        let mut errors = Vec::new();
        for (k, v) in pairs {
            if let Err(e) = self.set_from_text_noted(k.trim(), v) {
                errors.push(e);
            }
        }
        errors
    }

    /// Applies a TOML settings file: every key present overrides the current value; the
    /// `[[era]]` array replaces the era table. See [`Settings::apply_toml_noted`].
    pub fn apply_toml(&mut self, text: &str) -> Result<(), SettingsError> {
        self.apply_toml_noted(text).map(|_| ())
    }

    /// [`Settings::apply_toml`], returning the warnings of the readings (a renamed key, a
    /// decimal comma, a unit after the number, …) as (key, message). Every unknown key of
    /// the file is reported at once, each with the nearest known key.
    pub fn apply_toml_noted(&mut self, text: &str) -> Result<Vec<(String, String)>, SettingsError> {
        let table: toml::Table =
            toml::from_str(text).map_err(|e| SettingsError::Toml(e.to_string()))?;
        let unknown: Vec<String> = table
            .keys()
            .filter(|k| {
                k.as_str() != "era" && self.value_text(k).is_none() && self.renamed(k).is_none()
            })
            .cloned()
            .collect();
        if !unknown.is_empty() {
            return Err(SettingsError::UnknownKeys(unknown));
        }
        let mut notes = Vec::new();
        for (key, value) in table {
            if key == "era" {
                self.era = value
                    .try_into()
                    .map_err(|e: toml::de::Error| SettingsError::Toml(format!("[[era]]: {e}")))?;
                continue;
            }
            let text = match &value {
                toml::Value::String(s) => s.clone(),
                toml::Value::Integer(i) => i.to_string(),
                toml::Value::Float(f) => f.to_string(),
                other => {
                    return Err(SettingsError::BadValue {
                        key,
                        expected: "a number or a text",
                        found: other.to_string(),
                    });
                }
            };
            for n in self.set_from_text_noted(&key, &text)? {
                notes.push((key.clone(), n));
            }
        }
        self.validate()?;
        Ok(notes)
    }

    /// The new key of a renamed one, when this build knows the new key and not the old.
    fn renamed(&self, key: &str) -> Option<(&'static str, Rename)> {
        RENAMED_KEYS
            .iter()
            .find(|(old, new, _)| {
                *old == key && self.value_text(old).is_none() && self.value_text(new).is_some()
            })
            .map(|(_, new, how)| (*new, *how))
    }

    /// Sets one key from text the way the inventory's cells are read (one parser,
    /// [`crate::input::parse::read_survey_text`]): a decimal comma, digit grouping, the
    /// key's unit after the number (another unit of the same kind converted, any other
    /// refused), an ambiguous "1,200" put through [`Settings::validate`] both ways. A key
    /// renamed by a revision of the contract ([`RENAMED_KEYS`]) is accepted under its new
    /// name. Returns the warnings that say what was done.
    pub fn set_from_text_noted(
        &mut self,
        key: &str,
        text: &str,
    ) -> Result<Vec<String>, SettingsError> {
        let mut notes = Vec::new();
        let mut key = key.to_string();
        let mut text = text.to_string();
        if let Some((new, how)) = self.renamed(&key) {
            let old = std::mem::replace(&mut key, new.to_string());
            match how {
                Rename::Same => notes.push(format!(
                    "the settings key `{old}` is now `{new}` (revision 6 of the contract); the value is used for `{new}`: rename the key"
                )),
                Rename::Reciprocal => {
                    let v = parse_number(&text).ok_or_else(|| SettingsError::BadValue {
                        key: old.clone(),
                        expected: "a number",
                        found: text.clone(),
                    })?;
                    if v <= 0.0 {
                        return Err(SettingsError::OutOfRange {
                            key: old,
                            message: format!("must be greater than 0, found {v}"),
                        });
                    }
                    let new_v = 1.0 / v;
                    notes.push(format!(
                        "the settings key `{old}` = {v} is now `{new}` = 1/{v} = {new_v} (revision 6 of the contract: the factor became a divisor); write `{new} = {new_v}` instead"
                    ));
                    text = format!("{new_v}");
                }
            }
        }
        let key = key.as_str();
        let survey = crate::input::parse::survey_number(&text, false, false);
        let needs_reading = matches!(&survey, Ok(n) if n.unit.is_some() || n.alternative.is_some() || !n.notes.is_empty());
        if !needs_reading || self.value_text(key).is_none() {
            self.set_from_text(key, &text)?;
            return Ok(notes);
        }
        let base = self.clone();
        let check = |v: f64| -> Result<(), String> {
            let mut trial = base.clone();
            trial
                .set_from_text(key, &format!("{v}"))
                .and_then(|()| trial.validate())
                .map_err(|e| e.to_string())
        };
        match crate::input::parse::read_survey_text(
            &text,
            false,
            false,
            key,
            crate::input::columns::key_unit(key),
            crate::input::columns::Factor::ONE,
            &check,
        ) {
            crate::input::parse::Checked::Value(v, note) => {
                self.set_from_text(key, &format!("{v}"))?;
                notes.extend(note);
                Ok(notes)
            }
            crate::input::parse::Checked::Refused(message) => Err(SettingsError::OutOfRange {
                key: key.to_string(),
                message,
            }),
        }
    }

    /// Checks ranges that would make the method meaningless.
    pub fn validate(&self) -> Result<(), SettingsError> {
        let positive = [
            ("floor_weight_kpa", self.floor_weight_kpa),
            ("default_storey_height_m", self.default_storey_height_m),
            ("default_wall_length_m", self.default_wall_length_m),
            ("default_wall_thickness_m", self.default_wall_thickness_m),
            ("default_column_depth_m", self.default_column_depth_m),
            ("default_fc_mpa", self.default_fc_mpa),
            ("default_fy_mpa", self.default_fy_mpa),
            ("gamma_el", self.gamma_el),
            ("wall_rotation_divisor", self.wall_rotation_divisor),
            ("confidence_factor", self.confidence_factor),
            ("period_factor", self.period_factor),
            ("new_wall_length_m", self.new_wall_length_m),
            ("new_wall_thickness_m", self.new_wall_thickness_m),
            ("new_wall_fc_mpa", self.new_wall_fc_mpa),
            ("new_wall_fy_mpa", self.new_wall_fy_mpa),
            ("knapsack_resolution", self.knapsack_resolution),
            ("es_mpa", self.es_mpa),
            ("storey_height_max_m", self.storey_height_max_m),
            ("floor_weight_max_kpa", self.floor_weight_max_kpa),
        ];
        for (key, v) in positive {
            if v <= 0.0 {
                return Err(SettingsError::OutOfRange {
                    key: key.into(),
                    message: format!("must be greater than 0, found {v}"),
                });
            }
        }
        for (key, v) in [
            ("storey_height_min_m", self.storey_height_min_m),
            ("floor_weight_min_kpa", self.floor_weight_min_kpa),
            ("wall_area_mismatch_pct", self.wall_area_mismatch_pct),
            ("changes_rank_threshold", self.changes_rank_threshold),
        ] {
            if v < 0.0 {
                return Err(SettingsError::OutOfRange {
                    key: key.into(),
                    message: format!("must not be negative, found {v}"),
                });
            }
        }
        if self.max_storeys < 1.0 {
            return Err(SettingsError::OutOfRange {
                key: "max_storeys".into(),
                message: format!("must be at least 1, found {}", self.max_storeys),
            });
        }
        for (key, v) in [
            ("beta_demand", self.beta_demand),
            ("beta_capacity", self.beta_capacity),
            ("beta_fc_given", self.beta_fc_given),
            ("beta_fc_default", self.beta_fc_default),
            ("beta_weight_given", self.beta_weight_given),
            ("beta_weight_default", self.beta_weight_default),
            ("beta_hazard", self.beta_hazard),
        ] {
            if v < 0.0 {
                return Err(SettingsError::OutOfRange {
                    key: key.into(),
                    message: format!("a dispersion must not be negative, found {v}"),
                });
            }
        }
        if self.top_k == Some(0) {
            return Err(SettingsError::OutOfRange {
                key: "top_k".into(),
                message: "must be at least 1 (or empty for the default of method §13)".into(),
            });
        }
        // The inventory's unit-mistake limits apply to the settings' defaults too
        // (inventory.md, "Errors that catch unit mistakes"): a default storey height of
        // 3100 is a unit mistake in the settings as in a cell.
        {
            use crate::input::parse::{
                UNIT_MISTAKE_COLUMN_DEPTH_M, UNIT_MISTAKE_FLOOR_WEIGHT_KPA,
                UNIT_MISTAKE_STOREY_HEIGHT_M, UNIT_MISTAKE_WALL_LENGTH_M,
                UNIT_MISTAKE_WALL_THICKNESS_M, unit_mistake_check,
            };
            let length_slips: &'static [(&'static str, f64, f64)] =
                &[("mm", 1.0, 1000.0), ("cm", 1.0, 100.0)];
            let checks: [LimitCheck; 10] = [
                (
                    "default_storey_height_m",
                    self.default_storey_height_m,
                    "a storey height",
                    "m",
                    UNIT_MISTAKE_STOREY_HEIGHT_M,
                    length_slips,
                ),
                (
                    "default_wall_thickness_m",
                    self.default_wall_thickness_m,
                    "a wall thickness",
                    "m",
                    UNIT_MISTAKE_WALL_THICKNESS_M,
                    length_slips,
                ),
                (
                    "new_wall_thickness_m",
                    self.new_wall_thickness_m,
                    "a wall thickness",
                    "m",
                    UNIT_MISTAKE_WALL_THICKNESS_M,
                    length_slips,
                ),
                (
                    "default_column_depth_m",
                    self.default_column_depth_m,
                    "a column depth",
                    "m",
                    UNIT_MISTAKE_COLUMN_DEPTH_M,
                    length_slips,
                ),
                (
                    "default_wall_length_m",
                    self.default_wall_length_m,
                    "a wall length",
                    "m",
                    UNIT_MISTAKE_WALL_LENGTH_M,
                    length_slips,
                ),
                (
                    "new_wall_length_m",
                    self.new_wall_length_m,
                    "a wall length",
                    "m",
                    UNIT_MISTAKE_WALL_LENGTH_M,
                    length_slips,
                ),
                (
                    "floor_weight_kpa",
                    self.floor_weight_kpa,
                    "a floor weight",
                    "kPa",
                    UNIT_MISTAKE_FLOOR_WEIGHT_KPA,
                    &[],
                ),
                (
                    "default_fc_mpa",
                    self.default_fc_mpa,
                    "a concrete strength",
                    "MPa",
                    (5.0, 120.0),
                    &[],
                ),
                (
                    "new_wall_fc_mpa",
                    self.new_wall_fc_mpa,
                    "a concrete strength",
                    "MPa",
                    (5.0, 120.0),
                    &[],
                ),
                (
                    "default_fy_mpa",
                    self.default_fy_mpa,
                    "a steel strength",
                    "MPa",
                    (150.0, 700.0),
                    &[],
                ),
            ];
            for (key, v, what, unit, range, slips) in checks {
                unit_mistake_check(what, unit, range, slips)(v).map_err(|message| {
                    SettingsError::OutOfRange {
                        key: key.into(),
                        message,
                    }
                })?;
            }
        }
        if let Some(v) = self.agr_g {
            crate::input::parse::agr_check(crate::input::parse::UNIT_MISTAKE_AGR_MAX_G)(v)
                .map_err(|message| SettingsError::OutOfRange {
                    key: "agr_g".into(),
                    message,
                })?;
        }
        if let Some(v) = self.budget
            && v <= 0.0
        {
            return Err(SettingsError::OutOfRange {
                key: "budget".into(),
                message: format!(
                    "expected a positive amount, found {v}; leave it empty for no budget plan"
                ),
            });
        }
        for (key, v) in [("agr_g", self.agr_g), ("budget", self.budget)] {
            if let Some(v) = v
                && v < 0.0
            {
                return Err(SettingsError::OutOfRange {
                    key: key.into(),
                    message: format!("must not be negative, found {v}"),
                });
            }
        }
        Ok(())
    }

    /// Importance factor gamma_I for a use (EN 1998-1 Table 4.3, via the settings).
    pub fn gamma_i(&self, use_: crate::model::Use) -> f64 {
        use crate::model::Use;
        match use_ {
            Use::Residential => self.gamma_i_residential,
            Use::Office => self.gamma_i_office,
            Use::School => self.gamma_i_school,
            Use::Hospital => self.gamma_i_hospital,
            Use::Other => self.gamma_i_other,
        }
    }

    /// The source tag of a key, if the key exists.
    pub fn tag(key: &str) -> Option<&'static str> {
        KEYS.iter().find(|k| k.key == key).map(|k| k.tag)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_key_reads_back_its_own_default_text() {
        let s = Settings::default();
        for k in KEYS {
            let text = s.value_text(k.key).unwrap_or_default();
            let mut t = Settings::default();
            t.set_from_text(k.key, &text)
                .unwrap_or_else(|e| panic!("{}: {e}", k.key));
            assert_eq!(t, s, "key {}", k.key);
        }
    }

    #[test]
    fn toml_overrides_and_rejects_unknown_keys() {
        let mut s = Settings::default();
        s.apply_toml(
            "agr_g = 0.25\nspectrum = \"ec8-type2\"\n[[era]]\nto_year = 1975\nfc_mpa = 14\n",
        )
        .unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(s.agr_g, Some(0.25));
        assert_eq!(s.spectrum, Spectrum::Ec8Type2);
        assert_eq!(s.era.len(), 1);
        let mut s = Settings::default();
        // Every unknown key at once, each with the nearest known key, in one message.
        let e = s
            .apply_toml("agr = 0.2\nbudjet = 5\nzzzz = 1\n")
            .unwrap_err();
        assert!(
            matches!(&e, SettingsError::UnknownKeys(k) if k.len() == 3),
            "{e:?}"
        );
        let m = e.to_string();
        assert!(m.contains("`agr` (did you mean `agr_g`?)"), "{m}");
        assert!(m.contains("`budjet` (did you mean `budget`?)"), "{m}");
        assert!(m.contains("`zzzz`,") || m.ends_with("`zzzz`"), "{m}");
        assert_eq!(m.matches("unknown").count(), 1, "{m}");
        assert!(matches!(
            s.apply_toml("gamma_el = \"x\""),
            Err(SettingsError::BadValue { .. })
        ));
    }

    #[test]
    fn plausibility_limits_that_would_refuse_or_warn_every_row_are_refused() {
        for (key, value) in [
            ("max_storeys", "0"),
            ("storey_height_max_m", "0"),
            ("floor_weight_min_kpa", "-1"),
            ("wall_area_mismatch_pct", "-5"),
        ] {
            let mut s = Settings::default();
            s.set_from_text(key, value)
                .unwrap_or_else(|e| panic!("{e}"));
            assert!(
                matches!(s.validate(), Err(SettingsError::OutOfRange { key: k, .. }) if k == key),
                "{key}"
            );
        }
        assert_eq!(Settings::default().validate(), Ok(()));
    }

    #[test]
    fn seed_samples_and_top_k_are_unsigned_integers() {
        let mut s = Settings::default();
        assert_eq!((s.samples, s.seed, s.top_k), (0, 1, None));
        s.set_from_text("seed", "18446744073709551615")
            .unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(s.seed, u64::MAX);
        s.set_from_text("samples", "200.0")
            .unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(s.samples, 200);
        for (key, bad) in [
            ("seed", "-1"),
            ("seed", "1.5"),
            ("samples", "-3"),
            ("top_k", "x"),
        ] {
            assert!(
                matches!(
                    s.set_from_text(key, bad),
                    Err(SettingsError::BadValue { .. })
                ),
                "{key} = {bad}"
            );
        }
        s.set_from_text("top_k", "0")
            .unwrap_or_else(|e| panic!("{e}"));
        assert!(matches!(
            s.validate(),
            Err(SettingsError::OutOfRange { .. })
        ));
        let mut s = Settings::default();
        s.set_from_text("beta_demand", "-0.1")
            .unwrap_or_else(|e| panic!("{e}"));
        assert!(matches!(
            s.validate(),
            Err(SettingsError::OutOfRange { .. })
        ));
        let mut s = Settings::default();
        s.apply_toml("seed = 42\nsamples = 50\ntop_k = 3\n")
            .unwrap_or_else(|e| panic!("{e}"));
        assert_eq!((s.samples, s.seed, s.top_k), (50, 42, Some(3)));
    }

    #[test]
    fn settings_numbers_follow_the_inventory_rules() {
        let mut s = Settings::default();
        // A decimal comma in a TOML text value, a unit after the number, grouping.
        let notes =
            s.apply_toml("agr_g = \"0,28\"\nnear_fault_km = \"12 km\"\nbudget = \"2 000 000\"\n");
        assert_eq!(notes, Ok(()));
        assert_eq!(s.agr_g, Some(0.28));
        assert_eq!(s.near_fault_km, 12.0);
        assert_eq!(s.budget, Some(2_000_000.0));
        let notes = Settings::default()
            .apply_toml_noted("agr_g = \"0,28\"\n")
            .unwrap();
        assert_eq!(notes.len(), 1, "{notes:?}");
        // A unit of another kind is refused; so is an agR that looks like m/s².
        let e = Settings::default()
            .apply_toml("agr_g = \"0.3 MPa\"")
            .unwrap_err();
        assert!(e.to_string().contains("without its unit"), "{e}");
        // The unit-mistake limits of the inventory hold for the settings' defaults too.
        let e = Settings::default()
            .apply_toml("default_storey_height_m = 3100")
            .unwrap_err();
        assert!(e.to_string().contains("it looks like mm (3.1 m)"), "{e}");
        let e = Settings::default().apply_toml("agr_g = 2.943").unwrap_err();
        assert!(e.to_string().contains("m/s²"), "{e}");
        // "1,200" as agR: 1200 g is refused, so 1.2 is used with a warning.
        let mut s = Settings::default();
        let notes = s.set_from_text_noted("agr_g", "1,200").unwrap();
        assert_eq!((s.agr_g, notes.len()), (Some(1.2), 1));
        // "1,200" as a budget: both readings plausible, refused showing both.
        let e = Settings::default()
            .set_from_text_noted("budget", "1,200")
            .unwrap_err()
            .to_string();
        assert!(e.contains("1.2") && e.contains("1200"), "{e}");
    }

    #[test]
    fn a_renamed_key_is_accepted_under_its_new_name_with_a_warning() {
        for (old, new, how) in RENAMED_KEYS {
            let mut s = Settings::default();
            let known_new = s.value_text(new).is_some();
            let known_old = s.value_text(old).is_some();
            // Exactly one of the two names is a key of this build.
            assert!(known_new != known_old, "{old} / {new}");
            let notes = s.set_from_text_noted(old, "0.625").unwrap();
            if known_new {
                assert_eq!(notes.len(), 1, "{notes:?}");
                assert!(notes[0].contains(new), "{notes:?}");
                let expected = match how {
                    Rename::Same => 0.625,
                    Rename::Reciprocal => 1.6,
                };
                assert_eq!(s.value_text(new), Some(format!("{expected}")));
            } else {
                assert!(notes.is_empty());
            }
        }
    }

    #[test]
    fn decimal_comma_and_empty_values_in_sheet_cells() {
        let mut s = Settings::default();
        let errs = s.apply_pairs([
            ("agr_g", "0,3"),
            ("pi_threshold_pct", ""),
            ("default_ground_type", "b"),
        ]);
        assert!(errs.is_empty());
        assert_eq!(s.agr_g, Some(0.3));
        assert_eq!(s.default_ground_type, GroundType::B);
    }
}
