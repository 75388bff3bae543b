//! Checked positions: WGS84 decimal degrees in range (common practice: latitude ±90,
//! longitude ±180), refused with a message naming the value.

use analysis::{CoordinateError, LatLon};

#[test]
fn positions_out_of_range_are_refused_with_the_value() {
    assert_eq!(LatLon::new(91.0, 0.0), Err(CoordinateError::LatitudeOutOfRange(91.0)));
    assert_eq!(LatLon::new(0.0, -180.5), Err(CoordinateError::LongitudeOutOfRange(-180.5)));
    assert!(matches!(LatLon::new(f64::NAN, 0.0), Err(CoordinateError::LatitudeOutOfRange(v)) if v.is_nan()));
    let err = LatLon::new(0.0, 200.0).unwrap_err();
    assert_eq!(err.to_string(), "longitude must be between -180 and 180 degrees, got 200");
}

#[test]
fn positions_read_from_json_are_checked_too() {
    let good: LatLon = serde_json::from_str(r#"{"lat": 50.1, "lon": -5.5}"#).unwrap();
    assert_eq!((good.lat(), good.lon()), (50.1, -5.5));
    let bad = serde_json::from_str::<LatLon>(r#"{"lat": 95.0, "lon": 0.0}"#).unwrap_err();
    assert!(bad.to_string().contains("latitude must be between -90 and 90"), "{bad}");
    assert_eq!(serde_json::to_string(&good).unwrap(), r#"{"lat":50.1,"lon":-5.5}"#);
}
