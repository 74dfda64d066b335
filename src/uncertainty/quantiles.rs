/*!
The quantile rule of method §13 and the rank correlation used by `explain`.
*/

/// 0-based index of the p % quantile of `n` values sorted ascending (method §13):
/// ⌈p·n/100⌉ − 1, computed in integers as (p·n + 99) div 100 − 1; `None` for n = 0.
/// p = 0 gives index 0 (the smallest value).
pub fn quantile_index(p: u32, n: usize) -> Option<usize> {
    if n == 0 {
        return None;
    }
    // (p·n + 99) div 100 = ⌈p·n/100⌉.
    let idx = (u128::from(p) * n as u128).div_ceil(100);
    Some((idx.saturating_sub(1) as usize).min(n - 1))
}

/// The p % quantile of values already sorted ascending (method §13).
pub fn quantile_sorted<T: Copy>(sorted: &[T], p: u32) -> Option<T> {
    quantile_index(p, sorted.len()).and_then(|i| sorted.get(i).copied())
}

/// p05, p50 and p95 of a set of values (sorted in place, total order for floats).
pub fn p05_p50_p95(values: &mut [f64]) -> Option<[f64; 3]> {
    values.sort_by(f64::total_cmp);
    Some([
        quantile_sorted(values, 5)?,
        quantile_sorted(values, 50)?,
        quantile_sorted(values, 95)?,
    ])
}

/// p05, p50 and p95 of integers (sorted in place).
pub fn p05_p50_p95_int<T: Copy + Ord>(values: &mut [T]) -> Option<[T; 3]> {
    values.sort_unstable();
    Some([
        quantile_sorted(values, 5)?,
        quantile_sorted(values, 50)?,
        quantile_sorted(values, 95)?,
    ])
}

/// Mid-ranks (1-based, ties get the mean of their positions) of a sample.
pub fn mid_ranks(values: &[f64]) -> Vec<f64> {
    let mut idx: Vec<usize> = (0..values.len()).collect();
    idx.sort_by(|&a, &b| values[a].total_cmp(&values[b]));
    let mut ranks = vec![0.0; values.len()];
    let mut start = 0;
    while start < idx.len() {
        let mut end = start + 1;
        while end < idx.len() && values[idx[end]].total_cmp(&values[idx[start]]).is_eq() {
            end += 1;
        }
        // Positions start+1 ..= end share the mean rank.
        let mean = (start + 1 + end) as f64 / 2.0;
        for &k in &idx[start..end] {
            ranks[k] = mean;
        }
        start = end;
    }
    ranks
}

/// Spearman rank correlation of two samples of equal length (the Pearson correlation of
/// their mid-ranks); `None` when fewer than two values or one sample is constant.
pub fn spearman(a: &[f64], b: &[f64]) -> Option<f64> {
    if a.len() != b.len() || a.len() < 2 {
        return None;
    }
    let ra = mid_ranks(a);
    let rb = mid_ranks(b);
    let n = ra.len() as f64;
    let ma = ra.iter().sum::<f64>() / n;
    let mb = rb.iter().sum::<f64>() / n;
    let (mut sab, mut saa, mut sbb) = (0.0, 0.0, 0.0);
    for (x, y) in ra.iter().zip(&rb) {
        sab += (x - ma) * (y - mb);
        saa += (x - ma) * (x - ma);
        sbb += (y - mb) * (y - mb);
    }
    (saa > 0.0 && sbb > 0.0).then(|| sab / (saa * sbb).sqrt())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn quantile_rule_by_hand_at_small_n() {
        // method §13: index ⌈p·N/100⌉ − 1. By hand:
        // N = 1: every quantile is the only value (index 0).
        assert_eq!(quantile_index(5, 1), Some(0));
        assert_eq!(quantile_index(50, 1), Some(0));
        assert_eq!(quantile_index(95, 1), Some(0));
        // N = 10: p05 → ⌈0.5⌉ − 1 = 0; p50 → ⌈5⌉ − 1 = 4; p95 → ⌈9.5⌉ − 1 = 9.
        assert_eq!(quantile_index(5, 10), Some(0));
        assert_eq!(quantile_index(50, 10), Some(4));
        assert_eq!(quantile_index(95, 10), Some(9));
        // N = 20: p05 → ⌈1⌉ − 1 = 0; p50 → 9; p95 → ⌈19⌉ − 1 = 18.
        assert_eq!(quantile_index(5, 20), Some(0));
        assert_eq!(quantile_index(50, 20), Some(9));
        assert_eq!(quantile_index(95, 20), Some(18));
        // N = 3: p50 → ⌈1.5⌉ − 1 = 1; p95 → ⌈2.85⌉ − 1 = 2.
        assert_eq!(quantile_index(50, 3), Some(1));
        assert_eq!(quantile_index(95, 3), Some(2));
        // N = 200: p05 → 9, p50 → 99, p95 → 189.
        assert_eq!(quantile_index(5, 200), Some(9));
        assert_eq!(quantile_index(50, 200), Some(99));
        assert_eq!(quantile_index(95, 200), Some(189));
        assert_eq!(quantile_index(50, 0), None);
        let mut v = vec![5.0, 1.0, 4.0, 2.0, 3.0];
        // N = 5: p05 → 0 (1.0), p50 → ⌈2.5⌉ − 1 = 2 (3.0), p95 → ⌈4.75⌉ − 1 = 4 (5.0).
        assert_eq!(p05_p50_p95(&mut v), Some([1.0, 3.0, 5.0]));
        let mut r = vec![7u32, 3, 9, 1];
        // N = 4: p05 → 0, p50 → 1, p95 → 3.
        assert_eq!(p05_p50_p95_int(&mut r), Some([1, 3, 9]));
    }

    #[test]
    fn spearman_of_monotone_and_reversed_samples() {
        let a = [1.0, 2.0, 3.0, 4.0, 5.0];
        let b = [10.0, 20.0, 25.0, 100.0, 1000.0];
        assert!((spearman(&a, &b).unwrap() - 1.0).abs() < 1e-12);
        let c = [5.0, 4.0, 3.0, 2.0, 1.0];
        assert!((spearman(&a, &c).unwrap() + 1.0).abs() < 1e-12);
        assert_eq!(spearman(&a, &[1.0; 5]), None);
        // Ties get mid-ranks: [1, 2.5, 2.5, 4].
        assert_eq!(mid_ranks(&[0.1, 0.5, 0.5, 0.9]), vec![1.0, 2.5, 2.5, 4.0]);
    }
}
