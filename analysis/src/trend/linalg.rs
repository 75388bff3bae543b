//! The little linear algebra a GLM needs: Cholesky factorisation of a small symmetric
//! positive-definite matrix, solving with it, and inverting it.
//!
//! Trend models have a handful of coefficients, so a plain dense Cholesky is exact enough
//! and keeps this crate free of a matrix library (it also compiles into the offline app).

/// A lower-triangular Cholesky factor `L` with `A = L Lᵀ`, stored row-major.
#[derive(Debug)]
pub(crate) struct Cholesky {
    size: usize,
    lower: Vec<f64>,
}

/// The matrix is singular or nearly so; `column` is the first dependent column.
#[derive(Debug)]
pub(crate) struct NotPositiveDefinite {
    pub(crate) column: usize,
}

/// A pivot smaller than this fraction of its column's own diagonal entry means the column
/// is (numerically) a combination of the earlier ones.
const RELATIVE_PIVOT_TOLERANCE: f64 = 1e-12;

impl Cholesky {
    /// Factorises the `size × size` symmetric matrix `a` (row-major).
    pub(crate) fn factor(a: &[f64], size: usize) -> Result<Self, NotPositiveDefinite> {
        let mut lower = vec![0.0; size * size];
        for i in 0..size {
            for j in 0..=i {
                let dot: f64 = (0..j).map(|k| lower[i * size + k] * lower[j * size + k]).sum();
                let value = a[i * size + j] - dot;
                if i == j {
                    if value.is_nan() || value <= RELATIVE_PIVOT_TOLERANCE * a[i * size + i] {
                        return Err(NotPositiveDefinite { column: i });
                    }
                    lower[i * size + i] = value.sqrt();
                } else {
                    lower[i * size + j] = value / lower[j * size + j];
                }
            }
        }
        Ok(Self { size, lower })
    }

    /// Solves `A x = b`.
    pub(crate) fn solve(&self, b: &[f64]) -> Vec<f64> {
        let n = self.size;
        let l = |i: usize, j: usize| self.lower[i * n + j];
        let mut y = vec![0.0; n];
        for i in 0..n {
            let dot: f64 = (0..i).map(|k| l(i, k) * y[k]).sum();
            y[i] = (b[i] - dot) / l(i, i);
        }
        let mut x = vec![0.0; n];
        for i in (0..n).rev() {
            let dot: f64 = (i + 1..n).map(|k| l(k, i) * x[k]).sum();
            x[i] = (y[i] - dot) / l(i, i);
        }
        x
    }

    /// The whole of `A⁻¹`, row-major.
    pub(crate) fn inverse(&self) -> Vec<f64> {
        let n = self.size;
        let columns: Vec<Vec<f64>> = (0..n)
            .map(|j| {
                let unit: Vec<f64> = (0..n).map(|i| if i == j { 1.0 } else { 0.0 }).collect();
                self.solve(&unit)
            })
            .collect();
        (0..n * n).map(|k| columns[k % n][k / n]).collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn solves_and_inverts_a_small_system() {
        // A = [[4, 2], [2, 3]]; A⁻¹ = [[3, −2], [−2, 4]] / 8 (hand calculation).
        let chol = Cholesky::factor(&[4.0, 2.0, 2.0, 3.0], 2).unwrap();
        let x = chol.solve(&[2.0, 1.0]);
        assert!((x[0] - 0.5).abs() < 1e-12 && x[1].abs() < 1e-12, "{x:?}");
        let inverse = chol.inverse();
        for (got, want) in inverse.iter().zip([0.375, -0.25, -0.25, 0.5]) {
            assert!((got - want).abs() < 1e-12, "{inverse:?}");
        }
    }

    #[test]
    fn dependent_columns_are_reported() {
        let err = Cholesky::factor(&[1.0, 2.0, 2.0, 4.0], 2).unwrap_err();
        assert_eq!(err.column, 1);
    }
}
