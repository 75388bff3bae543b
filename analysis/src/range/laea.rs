//! Lambert azimuthal equal-area projection on the WGS84 ellipsoid, oblique and polar.
//!
//! AOO counts grid cells of a fixed area, so the grid must be laid out in an equal-area
//! projection. The forward formulas are Snyder's for the ellipsoid (*Map Projections — A
//! Working Manual*, USGS Professional Paper 1395, 1987, chapter 24, recalled from memory):
//! the oblique aspect for any centre off the poles, the polar aspect for a centre on one;
//! the projection PROJ calls `laea`, and the tests check both against pyproj to the
//! millimetre. They are written out here rather than taken from a projection crate because
//! only the forward direction is needed, a handful of floating-point operations per point
//! keeps a million records fast, and the same code compiles to WebAssembly for the app.
//!
//! A point is given as its unit vector (`sphere::unit_vector`), which the caller computes
//! once per record for everything else it measures: sin φ is its z, and cos φ sin(λ − λ0),
//! cos φ cos(λ − λ0) come from its x and y by a rotation, so no further sine or cosine is
//! taken per record.

use crate::sphere::Vec3;

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
    sin_lon0: f64,
    cos_lon0: f64,
    aspect: Aspect,
}

#[derive(Debug, Clone, Copy)]
enum Aspect {
    Oblique {
        sin_beta1: f64,
        cos_beta1: f64,
        rq: f64,
        d: f64,
    },
    /// Centred on a pole: +1 for the north pole, −1 for the south.
    Polar {
        pole: f64,
    },
}

impl Laea {
    /// Sets up the projection centred on `lat0`, `lon0` (degrees).
    pub(crate) fn new(lat0: f64, lon0: f64) -> Self {
        let e2 = WGS84_F * (2.0 - WGS84_F);
        let e = e2.sqrt();
        let qp = authalic_q(1.0, e, e2);
        let (sin_lon0, cos_lon0) = lon0.to_radians().sin_cos();
        let aspect = if lat0.abs() == 90.0 {
            Aspect::Polar { pole: lat0.signum() }
        } else {
            let phi1 = lat0.to_radians();
            let sin_beta1 = authalic_q(phi1.sin(), e, e2) / qp;
            let cos_beta1 = (1.0 - sin_beta1 * sin_beta1).sqrt();
            let rq = WGS84_A * (qp / 2.0).sqrt();
            let m1 = phi1.cos() / (1.0 - e2 * phi1.sin().powi(2)).sqrt();
            let d = WGS84_A * m1 / (rq * cos_beta1);
            Aspect::Oblique { sin_beta1, cos_beta1, rq, d }
        };
        Self { e, e2, qp, sin_lon0, cos_lon0, aspect }
    }

    /// Projects a point to easting and northing in metres from the centre.
    ///
    /// Returns `None` for a point more than a quarter of the globe (90° of arc on the
    /// authalic sphere) from the centre, where cells are stretched to twice their width
    /// and the projection runs towards its singular antipode.
    pub(crate) fn forward(&self, v: Vec3) -> Option<(f64, f64)> {
        let sin_lat = v[2];
        // A unit vector's x and y cannot overflow, so no `hypot` is needed.
        let cos_lat = (v[0] * v[0] + v[1] * v[1]).sqrt();
        // cos φ sin(λ − λ0) and cos φ cos(λ − λ0): the vector turned by −λ0 about the axis.
        let east = v[1] * self.cos_lon0 - v[0] * self.sin_lon0;
        let along = v[0] * self.cos_lon0 + v[1] * self.sin_lon0;
        match self.aspect {
            Aspect::Oblique { sin_beta1, cos_beta1, rq, d } => {
                let sin_beta = authalic_q(sin_lat, self.e, self.e2) / self.qp;
                let cos_beta = (1.0 - sin_beta * sin_beta).max(0.0).sqrt();
                // cos β sin(λ − λ0) and cos β cos(λ − λ0); both 0 at a pole, where λ means nothing.
                let scale = if cos_lat > 0.0 { cos_beta / cos_lat } else { 0.0 };
                let (sin_part, cos_part) = (scale * east, scale * along);
                let cos_arc = sin_beta1 * sin_beta + cos_beta1 * cos_part;
                if cos_arc < 0.0 {
                    return None;
                }
                let b = rq * (2.0 / (1.0 + cos_arc)).sqrt();
                let x = b * d * sin_part;
                let y = (b / d) * (cos_beta1 * sin_beta - sin_beta1 * cos_part);
                Some((x, y))
            }
            Aspect::Polar { pole } => {
                // Snyder's polar forms: ρ = a √(qp ∓ q), q taken on the pole's side (q is odd
                // in sin φ) so the pole itself lands exactly on the centre; beyond the equator
                // is beyond a quarter globe.
                let q = authalic_q(pole * sin_lat, self.e, self.e2);
                if q < 0.0 {
                    return None;
                }
                let rho = WGS84_A * (self.qp - q).max(0.0).sqrt();
                let scale = if cos_lat > 0.0 { rho / cos_lat } else { 0.0 };
                Some((scale * east, -pole * scale * along))
            }
        }
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
    use crate::coordinates::LatLon;
    use crate::sphere::unit_vector;

    fn at(lat: f64, lon: f64) -> Vec3 {
        unit_vector(LatLon::new(lat, lon).unwrap())
    }

    #[test]
    fn centre_projects_to_origin() {
        for (lat, lon) in [(52.0, 10.0), (90.0, 0.0), (-90.0, 140.0)] {
            let (x, y) = Laea::new(lat, lon).forward(at(lat, lon)).unwrap();
            assert!(x.abs() < 1e-6 && y.abs() < 1e-6, "({x}, {y}) for {lat}, {lon}");
        }
    }

    #[test]
    fn points_beyond_a_quarter_globe_are_refused() {
        let laea = Laea::new(52.0, 10.0);
        assert!(laea.forward(at(-52.0, -170.0)).is_none());
        assert!(laea.forward(at(0.0, 10.0)).is_some());
        assert!(Laea::new(90.0, 0.0).forward(at(-1.0, 0.0)).is_none());
    }
}
