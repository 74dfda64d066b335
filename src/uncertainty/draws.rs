/*!
The portable draws of method §13: FNV-1a 64 keys, splitmix64, the stream state rule, the
uniform u = ((x ≫ 12) + 0.5)/2^52 and the inverse standard normal CDF Φ⁻¹ (Wichura's
algorithm AS 241, PPND16). Everything up to u is exact integer / double arithmetic, so u is
bit-identical in every implementation; Φ⁻¹ is accurate to about 1e-16.

The AS 241 coefficients are written with every digit the paper prints (more than a double
holds), so that they can be checked against the publication digit by digit; hence the
`excessive_precision` allowance.
*/
#![allow(clippy::excessive_precision)]

/// FNV-1a 64 offset basis (Fowler/Noll/Vo, method §13).
pub const FNV_OFFSET: u64 = 0xCBF2_9CE4_8422_2325;
/// FNV-1a 64 prime (Fowler/Noll/Vo, method §13).
pub const FNV_PRIME: u64 = 0x0000_0100_0000_01B3;
/// splitmix64 increment (golden-ratio constant), also the seed multiplier of the state rule.
pub const GOLDEN: u64 = 0x9E37_79B9_7F4A_7C15;
/// Sample-index multiplier of the state rule (method §13).
pub const SAMPLE_MUL: u64 = 0xD1B5_4A32_D192_ED03;

/// FNV-1a 64 of a byte string: h = offset; per byte h = (h ⊕ byte)·prime (wrapping).
pub fn fnv1a64(bytes: &[u8]) -> u64 {
    bytes.iter().fold(FNV_OFFSET, |h, &b| {
        (h ^ u64::from(b)).wrapping_mul(FNV_PRIME)
    })
}

/// Stream key of a text (method §13): FNV-1a 64 of its UTF-8 bytes.
pub fn key(text: &str) -> u64 {
    fnv1a64(text.as_bytes())
}

/// Stream key of a district (method §13): key("district:" + name).
pub fn district_key(name: &str) -> u64 {
    let mut h = fnv1a64(b"district:");
    for &b in name.as_bytes() {
        h = (h ^ u64::from(b)).wrapping_mul(FNV_PRIME);
    }
    h
}

/// One splitmix64 step (Steele, Lea & Flood 2014; Vigna's reference splitmix64.c):
/// state += golden; z = state; z = (z ⊕ z≫30)·0xBF58476D1CE4E5B9;
/// z = (z ⊕ z≫27)·0x94D049BB133111EB; return z ⊕ z≫31 (all wrapping).
pub fn splitmix64(state: &mut u64) -> u64 {
    *state = state.wrapping_add(GOLDEN);
    let mut z = *state;
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

/// Initial state of a stream for sample j (1-based) (method §13):
/// k ⊕ (seed·golden) ⊕ (j·0xD1B54A32D192ED03), wrapping products.
pub fn stream_state(stream_key: u64, seed: u64, sample: u64) -> u64 {
    stream_key ^ seed.wrapping_mul(GOLDEN) ^ sample.wrapping_mul(SAMPLE_MUL)
}

/// 2^52 as a double.
const TWO_52: f64 = 4_503_599_627_370_496.0;

/// The uniform of one draw: u = ((x ≫ 12) + 0.5)/2^52, exact in double precision and
/// always inside (0, 1) (the 52-bit integer plus one half has 53 significant bits).
pub fn uniform(x: u64) -> f64 {
    ((x >> 12) as f64 + 0.5) / TWO_52
}

/// A stream of standard normal draws for one key and sample (method §13).
#[derive(Debug, Clone)]
pub struct Stream {
    state: u64,
}

impl Stream {
    /// The stream of `stream_key` in sample `sample` (1-based) with `seed`.
    pub fn new(stream_key: u64, seed: u64, sample: u64) -> Self {
        Stream {
            state: stream_state(stream_key, seed, sample),
        }
    }
    /// The next uniform u.
    pub fn next_uniform(&mut self) -> f64 {
        uniform(splitmix64(&mut self.state))
    }
    /// The next standard normal draw z = Φ⁻¹(u).
    pub fn next_normal(&mut self) -> f64 {
        inverse_normal_cdf(self.next_uniform())
    }
}

// Wichura, M. J. (1988), Algorithm AS 241: The percentage points of the normal
// distribution. Applied Statistics 37(3), 477–484: PPND16 coefficients.
const SPLIT1: f64 = 0.425;
const SPLIT2: f64 = 5.0;
const CONST1: f64 = 0.180625;
const CONST2: f64 = 1.6;
/// Numerator coefficients, |p − 0.5| ≤ 0.425 (A0…A7).
pub const A: [f64; 8] = [
    3.387_132_872_796_366_608,
    1.331_416_678_917_843_774_5e2,
    1.971_590_950_306_551_442_7e3,
    1.373_169_376_550_946_112_5e4,
    4.592_195_393_154_987_145_7e4,
    6.726_577_092_700_870_085_3e4,
    3.343_057_558_358_812_810_5e4,
    2.509_080_928_730_122_672_7e3,
];
/// Denominator coefficients B1…B7 (B0 = 1).
pub const B: [f64; 8] = [
    1.0,
    4.231_333_070_160_091_125_2e1,
    6.871_870_074_920_579_083e2,
    5.394_196_021_424_751_107_7e3,
    2.121_379_430_158_659_586_7e4,
    3.930_789_580_009_271_061e4,
    2.872_908_573_572_194_267_4e4,
    5.226_495_278_852_854_561e3,
];
/// Numerator coefficients, intermediate tail r = √(−ln q) ≤ 5 (C0…C7).
pub const C: [f64; 8] = [
    1.423_437_110_749_683_577_34,
    4.630_337_846_156_545_295_9,
    5.769_497_221_460_691_405_5,
    3.647_848_324_763_204_605_04,
    1.270_458_252_452_368_382_58,
    2.417_807_251_774_506_117_7e-1,
    2.272_384_498_926_918_458_33e-2,
    7.745_450_142_783_414_076_4e-4,
];
/// Denominator coefficients D1…D7 (D0 = 1).
pub const D: [f64; 8] = [
    1.0,
    2.053_191_626_637_758_821_87,
    1.676_384_830_183_803_849_4,
    6.897_673_349_851_000_045_5e-1,
    1.481_039_764_274_800_745_9e-1,
    1.519_866_656_361_645_719_66e-2,
    5.475_938_084_995_344_946e-4,
    1.050_750_071_644_416_843_24e-9,
];
/// Numerator coefficients, far tail r > 5 (E0…E7).
pub const E: [f64; 8] = [
    6.657_904_643_501_103_777_2,
    5.463_784_911_164_114_369_9,
    1.784_826_539_917_291_335_8,
    2.965_605_718_285_048_912_3e-1,
    2.653_218_952_657_612_309_3e-2,
    1.242_660_947_388_078_438_6e-3,
    2.711_555_568_743_487_578_15e-5,
    2.010_334_399_292_288_132_65e-7,
];
/// Denominator coefficients F1…F7 (F0 = 1).
pub const F: [f64; 8] = [
    1.0,
    5.998_322_065_558_879_376_9e-1,
    1.369_298_809_227_358_053_1e-1,
    1.487_536_129_085_061_485_25e-2,
    7.868_691_311_456_132_591e-4,
    1.846_318_317_510_054_681_8e-5,
    1.421_511_758_316_445_888_7e-7,
    2.044_263_103_389_939_785_64e-15,
];

/// Horner evaluation of c0 + c1·r + … + c7·r⁷.
fn poly(c: &[f64; 8], r: f64) -> f64 {
    c.iter().rev().fold(0.0, |acc, &k| acc * r + k)
}

/// Inverse standard normal CDF Φ⁻¹(p) for 0 < p < 1 (Wichura 1988, AS 241 PPND16, about
/// 1e-16 relative). Outside (0, 1) it returns ∓∞ (p ≤ 0 / p ≥ 1) and NaN for NaN; the
/// draws of method §13 never leave (0, 1).
pub fn inverse_normal_cdf(p: f64) -> f64 {
    if p.is_nan() {
        return f64::NAN;
    }
    let q = p - 0.5;
    if q.abs() <= SPLIT1 {
        let r = CONST1 - q * q;
        return q * poly(&A, r) / poly(&B, r);
    }
    let tail = if q < 0.0 { p } else { 1.0 - p };
    if tail <= 0.0 {
        return if q < 0.0 {
            f64::NEG_INFINITY
        } else {
            f64::INFINITY
        };
    }
    let r = (-tail.ln()).sqrt();
    let z = if r <= SPLIT2 {
        let r = r - CONST2;
        poly(&C, r) / poly(&D, r)
    } else {
        let r = r - SPLIT2;
        poly(&E, r) / poly(&F, r)
    };
    if q < 0.0 { -z } else { z }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn splitmix64_reference_outputs_from_state_zero() {
        // Source: Vigna's reference splitmix64.c (prng.di.unimi.it) / Java's
        // SplittableRandom, seeded with 0: the first three outputs. Exact (integers).
        let mut s = 0u64;
        assert_eq!(splitmix64(&mut s), 0xE220_A839_7B1D_CDAF);
        assert_eq!(splitmix64(&mut s), 0x6E78_9E6A_A1B9_65F4);
        assert_eq!(splitmix64(&mut s), 0x06C4_5D18_8009_454F);
    }

    #[test]
    fn fnv1a64_reference_vectors() {
        // Source: the FNV reference test vectors (Fowler/Noll/Vo, isthe.com/chongo/tech/comp/fnv):
        // FNV-1a 64 of "" is the offset basis, of "a" 0xaf63dc4c8601ec8c, of "foobar"
        // 0x85944171f73967e8. Exact (integers).
        assert_eq!(fnv1a64(b""), 0xCBF2_9CE4_8422_2325);
        assert_eq!(fnv1a64(b"a"), 0xAF63_DC4C_8601_EC8C);
        assert_eq!(fnv1a64(b"foobar"), 0x8594_4171_F739_67E8);
        assert_eq!(district_key("North"), key("district:North"));
        assert_eq!(district_key(""), key("district:"));
    }

    #[test]
    fn state_rule_and_uniform_range() {
        // method §13: state = k ⊕ seed·golden ⊕ j·0xD1B5…; seed 0, sample 0 leaves the key.
        assert_eq!(stream_state(0x1234, 0, 0), 0x1234);
        assert_eq!(stream_state(0, 1, 0), GOLDEN);
        assert_eq!(stream_state(0, 0, 1), SAMPLE_MUL);
        assert_eq!(stream_state(0, 2, 0), GOLDEN.wrapping_mul(2));
        // The extremes of u: x ≫ 12 = 0 and 2^52 − 1.
        assert_eq!(uniform(0), 0.5 / TWO_52);
        assert_eq!(uniform(u64::MAX), 1.0 - 0.5 / TWO_52);
        assert!(uniform(0) > 0.0 && uniform(u64::MAX) < 1.0);
        // A stream's first uniform is splitmix64 of its state.
        let mut st = stream_state(key("B-1"), 7, 3);
        let x = splitmix64(&mut st);
        assert_eq!(Stream::new(key("B-1"), 7, 3).next_uniform(), uniform(x));
    }

    #[test]
    fn as241_coefficients_match_the_published_hash_sums() {
        // Source: M. J. Wichura, "Algorithm AS 241: the percentage points of the normal
        // distribution", Applied Statistics 37(3), 1988, pp. 477-484. The paper gives, for
        // checking transcription, the sums of the mantissas of the coefficients: AB 55.8831928806149014439, CD 49.33206503301610289036,
        // EF 47.52583317549289671629 (B0, D0, F0 = 1 excluded). Tolerance 1e-12: sums of
        // 15 doubles.
        fn mantissa(v: f64) -> f64 {
            v / 10f64.powi(v.abs().log10().floor() as i32)
        }
        let sum = |n: &[f64; 8], d: &[f64; 8]| -> f64 {
            n.iter().map(|&v| mantissa(v)).sum::<f64>()
                + d.iter().skip(1).map(|&v| mantissa(v)).sum::<f64>()
        };
        assert!((sum(&A, &B) - 55.883_192_880_614_901_443_9).abs() < 1e-12);
        assert!((sum(&C, &D) - 49.332_065_033_016_102_890_36).abs() < 1e-12);
        assert!((sum(&E, &F) - 47.525_833_175_492_896_716_29).abs() < 1e-12);
    }

    #[test]
    fn inverse_normal_against_tabulated_quantiles() {
        // Reference values: the standard normal quantile evaluated with mpmath at 50 digits
        // (sqrt(2)·erfinv(2p − 1), and findroot of ncdf(z) = p in the far tails); the
        // central ones agree with printed normal tables (1.959964, 2.575829, 3.090232).
        // Tolerance 1e-9 absolute: the accuracy method §13 requires (AS 241 reaches ~1e-16).
        let cases = [
            (0.5, 0.0),
            (0.975, 1.959_963_984_540_054_2),
            (0.025, -1.959_963_984_540_054_2),
            (0.995, 2.575_829_303_548_900_8),
            (0.999, 3.090_232_306_167_813_5),
            (0.3, -0.524_400_512_708_040_78),
            (0.075, -1.439_531_470_938_455_9),
            (1e-10, -6.361_340_902_404_056_2),
            (1e-20, -9.262_340_089_798_407_6),
            (1e-50, -14.933_337_534_788_489),
            (1e-300, -37.047_096_299_361_199),
            // The ends of the range of u: 0.5/2^52 and 1 − 0.5/2^52.
            (0.5 / TWO_52, -8.209_536_151_601_386_9),
            (1.0 - 0.5 / TWO_52, 8.209_536_151_601_386_9),
        ];
        for (p, want) in cases {
            let got = inverse_normal_cdf(p);
            assert!((got - want).abs() < 1e-9, "p = {p}: {got} vs {want}");
        }
        assert!(inverse_normal_cdf(0.0) == f64::NEG_INFINITY);
        assert!(inverse_normal_cdf(1.0) == f64::INFINITY);
        // Monotone across the branch splits (0.075 = 0.5 − 0.425, r = 5).
        let mut prev = f64::NEG_INFINITY;
        for i in 1..2000 {
            let p = f64::from(i) / 2000.0;
            let z = inverse_normal_cdf(p);
            assert!(z > prev, "not increasing at {p}");
            prev = z;
        }
    }
}
