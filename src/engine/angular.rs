//! Angular-momentum algebra for one d shell: Wigner 3j symbols and the Gaunt (Condon–Shortley c^k)
//! coefficients, computed from their definitions rather than typed in.

/// n! as f64 (exact for the small arguments used here).
fn factorial(n: i64) -> f64 {
    (1..=n).fold(1.0, |acc, k| acc * k as f64)
}

/// Wigner 3j symbol (j1 j2 j3; m1 m2 m3) for integer arguments, by Racah's closed formula
/// (A. R. Edmonds, *Angular Momentum in Quantum Mechanics*, 1957, eq. 3.7.3).
pub fn wigner_3j(j1: i64, j2: i64, j3: i64, m1: i64, m2: i64, m3: i64) -> f64 {
    if m1 + m2 + m3 != 0 || j3 < (j1 - j2).abs() || j3 > j1 + j2 {
        return 0.0;
    }
    if m1.abs() > j1 || m2.abs() > j2 || m3.abs() > j3 {
        return 0.0;
    }
    let triangle = factorial(j1 + j2 - j3) * factorial(j1 - j2 + j3) * factorial(-j1 + j2 + j3)
        / factorial(j1 + j2 + j3 + 1);
    let pre = (triangle
        * factorial(j1 + m1)
        * factorial(j1 - m1)
        * factorial(j2 + m2)
        * factorial(j2 - m2)
        * factorial(j3 + m3)
        * factorial(j3 - m3))
    .sqrt();
    let kmin = 0.max(j2 - j3 - m1).max(j1 - j3 + m2);
    let kmax = (j1 + j2 - j3).min(j1 - m1).min(j2 + m2);
    let mut sum = 0.0;
    for k in kmin..=kmax {
        let denom = factorial(k)
            * factorial(j1 + j2 - j3 - k)
            * factorial(j1 - m1 - k)
            * factorial(j2 + m2 - k)
            * factorial(j3 - j2 + m1 + k)
            * factorial(j3 - j1 - m2 + k);
        let sign = if k % 2 == 0 { 1.0 } else { -1.0 };
        sum += sign / denom;
    }
    let phase = if (j1 - j2 - m3).rem_euclid(2) == 0 {
        1.0
    } else {
        -1.0
    };
    phase * pre * sum
}

/// Gaunt coefficient c^k(l m, l' m') = (−1)^m √((2l+1)(2l'+1)) (l k l'; 0 0 0)(l k l'; −m m−m' m'),
/// i.e. √(4π/(2k+1)) ∫ Y*_{lm} Y_{k,m−m'} Y_{l'm'} dΩ (E. U. Condon, G. H. Shortley,
/// *The Theory of Atomic Spectra*, 1935, ch. 6).
pub fn gaunt(l: i64, m: i64, k: i64, lp: i64, mp: i64) -> f64 {
    let phase = if m.rem_euclid(2) == 0 { 1.0 } else { -1.0 };
    phase
        * (((2 * l + 1) * (2 * lp + 1)) as f64).sqrt()
        * wigner_3j(l, k, lp, 0, 0, 0)
        * wigner_3j(l, k, lp, -m, m - mp, mp)
}

/// c^k(2 m, 2 m′) for the d shell, k = 0, 2, 4 (index k/2) and m, m′ = −2…2 (index m+2): the
/// only Gaunt coefficients the electron repulsion of d^n needs, computed once.
pub fn d_shell_gaunt(k: usize, m: i32, mp: i32) -> f64 {
    static TABLE: std::sync::OnceLock<[[[f64; 5]; 5]; 3]> = std::sync::OnceLock::new();
    let table = TABLE.get_or_init(|| {
        let mut t = [[[0.0; 5]; 5]; 3];
        for (ki, row) in t.iter_mut().enumerate() {
            for (i, cols) in row.iter_mut().enumerate() {
                for (j, c) in cols.iter_mut().enumerate() {
                    *c = gaunt(2, i as i64 - 2, 2 * ki as i64, 2, j as i64 - 2);
                }
            }
        }
        t
    });
    table[k / 2][(m + 2) as usize][(mp + 2) as usize]
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn three_j_known_values() {
        // (1 1 0; 0 0 0) = −1/√3 and (2 2 2; 0 0 0) = −√(2/35): Edmonds 1957, Table 2 (closed forms).
        assert_abs_diff_eq!(
            wigner_3j(1, 1, 0, 0, 0, 0),
            -1.0 / 3f64.sqrt(),
            epsilon = 1e-12
        );
        assert_abs_diff_eq!(
            wigner_3j(2, 2, 2, 0, 0, 0),
            -(2.0f64 / 35.0).sqrt(),
            epsilon = 1e-12
        );
    }

    #[test]
    fn gaunt_dd_table_entries() {
        // Condon & Shortley 1935, Table 1^6 (d–d): 35·c^2(2,0;2,0)·... written as c^2(0,0) = 2/7,
        // c^4(0,0) = 6/21 = 2/7, c^2(2,2) = −2/7, c^4(2,2) = 1/21 (standard entries, from memory).
        assert_abs_diff_eq!(gaunt(2, 0, 2, 2, 0), 2.0 / 7.0, epsilon = 1e-12);
        assert_abs_diff_eq!(gaunt(2, 0, 4, 2, 0), 6.0 / 21.0, epsilon = 1e-12);
        assert_abs_diff_eq!(gaunt(2, 2, 2, 2, 2), -2.0 / 7.0, epsilon = 1e-12);
        assert_abs_diff_eq!(gaunt(2, 2, 4, 2, 2), 1.0 / 21.0, epsilon = 1e-12);
    }

    #[test]
    fn gaunt_sum_rule() {
        // Σ_m' c^k(lm,l'm')² = (2l'+1)/(2k+1)·(2k+1)… orthonormality: Σ_{m'} [c^k]^2 = (2l+1)(l k l;000)^2·…
        // Checked here in its simplest form: Σ_m' c^0(2m,2m')² = 1.
        for m in -2..=2 {
            let s: f64 = (-2..=2).map(|mp| gaunt(2, m, 0, 2, mp).powi(2)).sum();
            assert_abs_diff_eq!(s, 1.0, epsilon = 1e-12);
        }
    }
}
