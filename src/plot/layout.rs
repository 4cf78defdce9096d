//! Label placement along one axis: labels keep their order, never overlap, stay inside the
//! allowed range, and sit as close to their wanted positions as they can (least squares). Where
//! a label moves, the figure draws a leader line from the curve to it.

/// Places labels of sizes `sizes` (extent along the axis, pt) near `wanted` (centre positions,
/// pt) inside `[lo, hi]` without overlap. Returns the centres, in input order. When the labels
/// cannot all fit, they are packed from `lo` (callers drop labels first, see [`fit_count`]).
pub fn spread(wanted: &[f64], sizes: &[f64], lo: f64, hi: f64) -> Vec<f64> {
    let n = wanted.len();
    let mut order: Vec<usize> = (0..n).collect();
    order.sort_by(|&a, &b| wanted[a].total_cmp(&wanted[b]).then(a.cmp(&b)));
    // Clusters of consecutive labels (in sorted order) packed edge to edge.
    struct Cluster {
        first: usize,
        last: usize,
        start: f64, // lower edge
        len: f64,
        // Sum over members of (wanted centre − offset of the member's centre from `start`).
        target_sum: f64,
    }
    let mut clusters: Vec<Cluster> = Vec::new();
    for (k, &i) in order.iter().enumerate() {
        let half = sizes[i] / 2.0;
        let mut c = Cluster {
            first: k,
            last: k,
            start: 0.0,
            len: sizes[i],
            target_sum: wanted[i] - half,
        };
        c.start = clamp(c.target_sum, lo, hi - c.len);
        clusters.push(c);
        // Merge with the previous cluster while they overlap.
        while clusters.len() > 1 {
            let m = clusters.len();
            let (prev_end, cur_start) = {
                let p = &clusters[m - 2];
                (p.start + p.len, clusters[m - 1].start)
            };
            if prev_end <= cur_start + 1e-9 {
                break;
            }
            let cur = clusters.pop().expect("two clusters");
            let prev = clusters.last_mut().expect("one cluster");
            // Members of `cur` are offset by prev.len inside the merged cluster.
            let count_cur = (cur.last - cur.first + 1) as f64;
            prev.target_sum += cur.target_sum - count_cur * prev.len;
            prev.len += cur.len;
            prev.last = cur.last;
            let count = (prev.last - prev.first + 1) as f64;
            prev.start = clamp(prev.target_sum / count, lo, hi - prev.len);
        }
    }
    let mut out = vec![0.0; n];
    for c in &clusters {
        let mut pos = c.start;
        for &i in &order[c.first..=c.last] {
            out[i] = pos + sizes[i] / 2.0;
            pos += sizes[i];
        }
    }
    out
}

fn clamp(x: f64, lo: f64, hi: f64) -> f64 {
    if hi < lo {
        lo
    } else {
        x.clamp(lo, hi)
    }
}

/// How many labels of size `size` fit in `[lo, hi]`.
pub fn fit_count(size: f64, lo: f64, hi: f64) -> usize {
    if size <= 0.0 || hi <= lo {
        0
    } else {
        ((hi - lo) / size).floor() as usize
    }
}

/// An axis-aligned box (pt) of a placed label, for overlap checks.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LabelBox {
    pub x: f64,
    pub y: f64,
    pub w: f64,
    pub h: f64,
}

impl LabelBox {
    /// Whether two boxes overlap by more than `tolerance` (pt) in both directions.
    pub fn overlaps(&self, other: &LabelBox, tolerance: f64) -> bool {
        let dx = (self.x + self.w).min(other.x + other.w) - self.x.max(other.x);
        let dy = (self.y + self.h).min(other.y + other.h) - self.y.max(other.y);
        dx > tolerance && dy > tolerance
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn separated_labels_stay_put() {
        let y = spread(&[10.0, 50.0, 90.0], &[8.0; 3], 0.0, 100.0);
        assert_eq!(y, vec![10.0, 50.0, 90.0]);
    }

    #[test]
    fn bunched_labels_spread_evenly_about_their_mean() {
        let y = spread(&[50.0, 50.5, 51.0, 49.5], &[8.0; 4], 0.0, 100.0);
        let mut s = y.clone();
        s.sort_by(f64::total_cmp);
        for w in s.windows(2) {
            assert!(w[1] - w[0] >= 8.0 - 1e-9);
        }
        let mean: f64 = y.iter().sum::<f64>() / 4.0;
        assert!((mean - 50.25).abs() < 1e-9, "{mean}");
        // Order is kept: the smallest wanted value gets the smallest position.
        assert!(y[3] < y[0] && y[0] < y[1] && y[1] < y[2]);
    }

    #[test]
    fn labels_stay_inside_the_range() {
        let y = spread(&[99.0, 99.5, 100.0], &[10.0; 3], 0.0, 100.0);
        assert!(y.iter().all(|&v| (5.0..=95.0).contains(&v)), "{y:?}");
        assert_eq!(fit_count(10.0, 0.0, 100.0), 10);
    }

    #[test]
    fn boxes() {
        let a = LabelBox {
            x: 0.0,
            y: 0.0,
            w: 10.0,
            h: 5.0,
        };
        let b = LabelBox {
            x: 9.0,
            y: 4.0,
            w: 10.0,
            h: 5.0,
        };
        assert!(a.overlaps(&b, 0.1));
        assert!(!a.overlaps(&b, 1.5));
    }
}
