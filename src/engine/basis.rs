//! Slater-determinant basis of a d^n configuration.
//!
//! Spin-orbitals are numbered 0..10: index `m + 2` for spin up (α) and `5 + m + 2` for spin down
//! (β), with m = −2..=2 the orbital magnetic quantum number of the complex spherical harmonics
//! Y_{2m} (Condon–Shortley phases). A determinant is a 10-bit occupation mask; its electrons are
//! ordered by increasing spin-orbital index, so every α electron precedes every β electron.

/// A Slater determinant as a bit mask of occupied spin-orbitals.
pub type Determinant = u16;

/// Number of spin-orbitals of a d shell.
pub const SPIN_ORBITALS: usize = 10;

/// Orbital magnetic quantum number m of spin-orbital `p`.
pub fn m_of(p: usize) -> i32 {
    (p % 5) as i32 - 2
}

/// Twice the spin projection (+1 for α, −1 for β) of spin-orbital `p`.
pub fn two_ms_of(p: usize) -> i32 {
    if p < 5 {
        1
    } else {
        -1
    }
}

/// Spin-orbital index of (m, spin up?).
pub fn spin_orbital(m: i32, up: bool) -> usize {
    (m + 2) as usize + if up { 0 } else { 5 }
}

/// Every determinant of d^n, in increasing mask order (C(10, n) of them).
pub fn all_determinants(n: usize) -> Vec<Determinant> {
    (0u16..1 << SPIN_ORBITALS)
        .filter(|d| d.count_ones() as usize == n)
        .collect()
}

/// Total M_L of a determinant.
pub fn total_ml(d: Determinant) -> i32 {
    (0..SPIN_ORBITALS)
        .filter(|&p| d & (1 << p) != 0)
        .map(m_of)
        .sum()
}

/// Twice the total M_S of a determinant.
pub fn total_two_ms(d: Determinant) -> i32 {
    (0..SPIN_ORBITALS)
        .filter(|&p| d & (1 << p) != 0)
        .map(two_ms_of)
        .sum()
}

/// Time reversal of a determinant: Θ|d⟩ = sign·|d′⟩. Θ is antiunitary and acts on each
/// electron as Θ|m α⟩ = (−1)^m |−m β⟩ and Θ|m β⟩ = −(−1)^m |−m α⟩ (Condon–Shortley phases,
/// Θ = e^{−iπS_y}K; A. Messiah, *Quantum Mechanics*, vol. 2, 1962, ch. XV); the sign also
/// holds the reordering of the electrons into increasing spin-orbital order.
pub fn time_reversed(d: Determinant) -> (Determinant, f64) {
    let mut targets = [0usize; SPIN_ORBITALS];
    let mut count = 0;
    let mut sign = 1.0;
    for p in (0..SPIN_ORBITALS).filter(|&p| d & (1 << p) != 0) {
        let m = m_of(p);
        let up = two_ms_of(p) == 1;
        if m.rem_euclid(2) == 1 {
            sign = -sign;
        }
        if !up {
            sign = -sign;
        }
        targets[count] = spin_orbital(-m, !up);
        count += 1;
    }
    let targets = &targets[..count];
    let inversions = (0..count)
        .flat_map(|i| (i + 1..count).map(move |j| (i, j)))
        .filter(|&(i, j)| targets[i] > targets[j])
        .count();
    if inversions % 2 == 1 {
        sign = -sign;
    }
    let mask = targets.iter().fold(0, |m, &t| m | (1 << t));
    (mask, sign)
}

/// Sign (−1)^k with k the number of occupied spin-orbitals below `p`.
fn parity_below(d: Determinant, p: usize) -> f64 {
    if (d & ((1u16 << p) - 1)).count_ones().is_multiple_of(2) {
        1.0
    } else {
        -1.0
    }
}

/// a_p |d⟩: the resulting determinant and sign, or None.
pub fn annihilate(d: Determinant, p: usize) -> Option<(Determinant, f64)> {
    if d & (1 << p) == 0 {
        None
    } else {
        Some((d & !(1 << p), parity_below(d, p)))
    }
}

/// a†_p |d⟩: the resulting determinant and sign, or None.
pub fn create(d: Determinant, p: usize) -> Option<(Determinant, f64)> {
    if d & (1 << p) != 0 {
        None
    } else {
        Some((d | (1 << p), parity_below(d, p)))
    }
}

/// Applies a†_p a_q to a determinant.
pub fn excite(d: Determinant, p: usize, q: usize) -> Option<(Determinant, f64)> {
    let (d1, s1) = annihilate(d, q)?;
    let (d2, s2) = create(d1, p)?;
    Some((d2, s1 * s2))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn basis_sizes_are_binomial() {
        // C(10, n): common practice (binomial coefficient).
        let expected = [1, 10, 45, 120, 210, 252, 210, 120, 45, 10, 1];
        for (n, &e) in expected.iter().enumerate() {
            assert_eq!(all_determinants(n).len(), e);
        }
    }

    #[test]
    fn anticommutation() {
        // a†_p a†_q = − a†_q a†_p on the empty shell.
        let (d1, s1) = create(0, 3).unwrap();
        let (d1, s2) = create(d1, 7).unwrap();
        let (d2, t1) = create(0, 7).unwrap();
        let (d2, t2) = create(d2, 3).unwrap();
        assert_eq!(d1, d2);
        assert_eq!(s1 * s2, -t1 * t2);
    }
}
