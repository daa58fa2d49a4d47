//! Non-negative least squares (Lawson & Hanson, *Solving Least Squares Problems*, 1974,
//! ch. 23) for the small dense systems of the datasheet loss fit.

/// Solves min ‖A·x − b‖ subject to x ≥ 0. `a` is row-major with `n` columns.
pub fn nnls(a: &[Vec<f64>], b: &[f64], n: usize) -> Vec<f64> {
    let mut x = vec![0.0; n];
    let mut passive = vec![false; n];
    let tol = 1e-12 * norm_inf(a) * (a.len().max(n) as f64);
    for _outer in 0..(3 * n + 10) {
        let w = gradient(a, b, &x, n);
        let candidate = (0..n)
            .filter(|&j| !passive[j] && w[j] > tol)
            .max_by(|&i, &j| w[i].total_cmp(&w[j]));
        let Some(j) = candidate else { break };
        passive[j] = true;
        loop {
            let z = solve_passive(a, b, &passive, n);
            if (0..n).all(|k| !passive[k] || z[k] > 0.0) {
                x = z;
                break;
            }
            // Step back towards z until a passive variable hits zero.
            let mut alpha = f64::INFINITY;
            for k in 0..n {
                if passive[k] && z[k] <= 0.0 {
                    alpha = alpha.min(x[k] / (x[k] - z[k]));
                }
            }
            for k in 0..n {
                x[k] += alpha * (z[k] - x[k]);
                if passive[k] && x[k] <= tol.max(1e-300) {
                    passive[k] = false;
                    x[k] = 0.0;
                }
            }
            if !passive.iter().any(|p| *p) {
                break;
            }
        }
    }
    x
}

fn norm_inf(a: &[Vec<f64>]) -> f64 {
    a.iter()
        .flat_map(|r| r.iter())
        .fold(0.0_f64, |m, v| m.max(v.abs()))
        .max(1e-300)
}

/// w = Aᵀ(b − A·x)
fn gradient(a: &[Vec<f64>], b: &[f64], x: &[f64], n: usize) -> Vec<f64> {
    let mut w = vec![0.0; n];
    for (row, bi) in a.iter().zip(b) {
        let r = bi - row.iter().zip(x).map(|(p, q)| p * q).sum::<f64>();
        for j in 0..n {
            w[j] += row[j] * r;
        }
    }
    w
}

/// Unconstrained least squares on the passive columns (Householder QR), zeros elsewhere.
fn solve_passive(a: &[Vec<f64>], b: &[f64], passive: &[bool], n: usize) -> Vec<f64> {
    let cols: Vec<usize> = (0..n).filter(|&j| passive[j]).collect();
    let sub: Vec<Vec<f64>> = a
        .iter()
        .map(|r| cols.iter().map(|&j| r[j]).collect())
        .collect();
    let sol = least_squares(&sub, b, cols.len());
    let mut z = vec![0.0; n];
    for (k, &j) in cols.iter().enumerate() {
        z[j] = sol[k];
    }
    z
}

/// Least squares by Householder QR with column scaling; rank-deficient columns get 0.
pub fn least_squares(a: &[Vec<f64>], b: &[f64], n: usize) -> Vec<f64> {
    let m = a.len();
    let scale: Vec<f64> = (0..n)
        .map(|j| {
            let s = a.iter().map(|r| r[j] * r[j]).sum::<f64>().sqrt();
            if s > 0.0 { s } else { 1.0 }
        })
        .collect();
    let mut r: Vec<Vec<f64>> = a
        .iter()
        .map(|row| (0..n).map(|j| row[j] / scale[j]).collect())
        .collect();
    let mut y = b.to_vec();
    let k_max = n.min(m);
    for k in 0..k_max {
        let norm = (k..m).map(|i| r[i][k] * r[i][k]).sum::<f64>().sqrt();
        if norm < 1e-14 {
            continue;
        }
        let alpha = if r[k][k] > 0.0 { -norm } else { norm };
        let mut v: Vec<f64> = (k..m).map(|i| r[i][k]).collect();
        v[0] -= alpha;
        let vnorm2: f64 = v.iter().map(|x| x * x).sum();
        if vnorm2 == 0.0 {
            continue;
        }
        #[allow(clippy::needless_range_loop)]
        for j in k..n {
            let dot: f64 = (k..m).map(|i| v[i - k] * r[i][j]).sum();
            let f = 2.0 * dot / vnorm2;
            for i in k..m {
                r[i][j] -= f * v[i - k];
            }
        }
        let dot: f64 = (k..m).map(|i| v[i - k] * y[i]).sum();
        let f = 2.0 * dot / vnorm2;
        for i in k..m {
            y[i] -= f * v[i - k];
        }
    }
    let mut x = vec![0.0; n];
    for k in (0..k_max).rev() {
        if r[k][k].abs() < 1e-12 {
            continue;
        }
        let s: f64 = ((k + 1)..n).map(|j| r[k][j] * x[j]).sum();
        x[k] = (y[k] - s) / r[k][k];
    }
    (0..n).map(|j| x[j] / scale[j]).collect()
}
