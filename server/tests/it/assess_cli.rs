//! `wrackline range` and `wrackline trend` as a user runs them: the real binary on real
//! files and on a data directory the real server wrote, with `--json` read back.

use std::path::Path;
use std::process::{Command, Output};

use serde_json::Value;

use crate::helpers::{spawn_app, submission};

fn wrackline(data_dir: &Path, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_wrackline"))
        .arg("--data-dir")
        .arg(data_dir)
        .args(args)
        .env_remove("RUST_BACKTRACE")
        .output()
        .unwrap()
}

fn json_of(output: &Output) -> Value {
    assert!(output.status.success(), "failed: {}", String::from_utf8_lossy(&output.stderr));
    serde_json::from_slice(&output.stdout).expect("--json prints JSON")
}

fn write(dir: &Path, name: &str, text: &str) -> std::path::PathBuf {
    let path = dir.join(name);
    std::fs::write(&path, text).unwrap();
    path
}

#[test]
fn range_from_a_csv_measures_the_hull_on_the_ellipsoid() {
    let dir = tempfile::tempdir().unwrap();
    // GeographicLib's published test polygon (0,−1) (−1,0) (0,1) (1,0) has area
    // 24619419146.0 m² (Karney 2013; GeographicLib); a fifth point inside leaves the hull as it is.
    let csv = "scientificName,decimalLatitude,decimalLongitude,eventDate\n\
               Raja clavata,0,-1,2020-01-01\nRaja clavata,-1,0,2020-02-01\nRaja clavata,0,1,2020-03-01\n\
               Raja clavata,1,0,2020-04-01\nRaja clavata,0.2,0.1,2020-05-01\n";
    let file = write(dir.path(), "points.csv", csv);
    let report = json_of(&wrackline(dir.path(), &["range", "--from", file.to_str().unwrap(), "--json"]));
    let group = &report["taxa"][0];
    assert_eq!(group["taxon"], "Raja clavata");
    let period = &group["periods"][0];
    assert_eq!(period["records"], 5);
    assert_eq!(period["sites"], 5);
    let eoo = period["figures"]["eoo_km2"].as_f64().unwrap();
    assert!((eoo - 24_619.419_146).abs() < 0.01, "EOO {eoo} km²");
    // Five points more than 2 km apart occupy five 2 × 2 km cells: 20 km² (IUCN Guidelines §4.10, common practice).
    assert_eq!(period["figures"]["aoo"]["area_km2"], 20.0);
    let text = period["figures"]["criterion_b"]["text"].as_str().unwrap();
    assert!(text.contains("not a listing decision") && text.contains("where people walk"), "{text}");
}

#[test]
fn two_periods_are_set_side_by_side_with_the_change() {
    let dir = tempfile::tempdir().unwrap();
    let csv = "scientificName,decimalLatitude,decimalLongitude,eventDate\n\
               thornback ray,52.40,-4.10,2016-06-01\nRaja clavata,52.10,-4.60,2018\n\
               Raja clavata,52.41,-4.11,2021-07\nRaja clavata,52.20,-4.40,2023-05-02\nRaja clavata,52.30,-4.20,2023-05-02/2023-05-04\n\
               Raja clavata,52.30,-4.20,2019-12-31/2020-01-01\n";
    let file = write(dir.path(), "two.csv", csv);
    let args = ["range", "--from", file.to_str().unwrap(), "--period", "2015-2019", "--period", "2020-2024", "--json"];
    let report = json_of(&wrackline(dir.path(), &args));
    let group = &report["taxa"][0];
    let records: Vec<i64> =
        group["periods"].as_array().unwrap().iter().map(|p| p["records"].as_i64().unwrap()).collect();
    assert_eq!(records, [2, 3], "the common name counts as its species; the record spanning new year is in neither");
    assert_eq!(report["left_out"]["outside_every_period"], 1);
    let change = &group["changes"][0];
    assert_eq!(change["records"], 1);
    let aoo: Vec<f64> = group["periods"]
        .as_array()
        .unwrap()
        .iter()
        .map(|p| p["figures"]["aoo"]["area_km2"].as_f64().unwrap())
        .collect();
    assert_eq!(change["aoo_km2"].as_f64().unwrap(), aoo[1] - aoo[0]);
}

#[test]
fn one_point_has_its_eoo_raised_to_the_aoo() {
    let dir = tempfile::tempdir().unwrap();
    let file =
        write(dir.path(), "one.csv", "decimalLatitude,decimalLongitude,scientificName\n52.4,-4.1,Squalus acanthias\n");
    let report = json_of(&wrackline(dir.path(), &["range", "--from", file.to_str().unwrap(), "--json"]));
    let figures = &report["taxa"][0]["periods"][0]["figures"];
    // IUCN Guidelines §4.9: when EOO < AOO, EOO is set to AOO (one cell, 4 km²).
    assert_eq!(figures["eoo_km2"], 4.0);
    assert_eq!(figures["eoo_raised_to_aoo"], true);
}

#[test]
fn a_bad_cell_is_named_by_file_line_and_column() {
    let dir = tempfile::tempdir().unwrap();
    let file = write(
        dir.path(),
        "bad.csv",
        "scientificName,decimalLatitude,decimalLongitude\nRaja clavata,52.4,-4.1\nRaja clavata,52.4,west\n",
    );
    let output = wrackline(dir.path(), &["range", "--from", file.to_str().unwrap()]);
    assert!(!output.status.success());
    let message = String::from_utf8_lossy(&output.stderr);
    assert!(message.contains("bad.csv, line 3, column 3 (decimalLongitude): `west` is not a number"), "{message}");
}

#[test]
fn trend_from_a_file_extrapolates_over_three_generations() {
    let dir = tempfile::tempdir().unwrap();
    // A steady 20% decline per 10 years, counts rounded to whole animals. The window is
    // the longer of 10 years and three generations (IUCN Red List Categories and Criteria
    // v3.1, criterion A [checked]): here 30 years; and 20% in 10 years is 1 − 0.8³ = 48.8%
    // over 30 years (arithmetic).
    let mut csv = String::from("year,count,effort\n");
    for (i, year) in (2010..=2020).enumerate() {
        csv.push_str(&format!("{year},{},2.5\n", (10_000.0 * 0.8_f64.powf(i as f64 / 10.0)).round()));
    }
    let file = write(dir.path(), "years.csv", &csv);
    let report = json_of(&wrackline(
        dir.path(),
        &["trend", "--from", file.to_str().unwrap(), "--generation-length", "10", "--json"],
    ));
    let trend = &report["trend"];
    assert_eq!(trend["window_years"], 30.0);
    let change = trend["window_change"]["estimate"].as_f64().unwrap();
    assert!((change + 0.488).abs() < 0.001, "window change {change}");
    assert!(
        trend["window_change"]["lower"].as_f64().unwrap() < change
            && change < trend["window_change"]["upper"].as_f64().unwrap()
    );
    assert!(trend["criterion_a"]["text"].as_str().unwrap().contains("not a listing decision"));
}

#[test]
fn trend_reports_mann_kendall_and_takes_the_generation_length_from_the_checklist() {
    let dir = tempfile::tempdir().unwrap();
    // Mann–Kendall with tie correction and Sen's slope (Hirsch et al. 1982; Gilbert 1987),
    // worked values checked with pymannkendall and scipy:
    // y = 5, 7, 7, 6, 4, 4, 3, 5, 2, 2 → S = −29, Var(S) = 121, Z = −2.545455, p = 0.010914, Sen −0.5.
    let counts = [5, 7, 7, 6, 4, 4, 3, 5, 2, 2];
    let mut csv = String::from("year,count,effort\n");
    for (i, c) in counts.iter().enumerate() {
        csv.push_str(&format!("{},{c},1\n", 2011 + i));
    }
    let file = write(dir.path(), "mk.csv", &csv);
    let report = json_of(&wrackline(
        dir.path(),
        &["trend", "--from", file.to_str().unwrap(), "--taxon", "small-spotted catshark", "--json"],
    ));
    let mk = &report["trend"]["mann_kendall"];
    assert_eq!(mk["s"], -29);
    assert!((mk["var_s"].as_f64().unwrap() - 121.0).abs() < 1e-9);
    assert!((mk["z"].as_f64().unwrap() + 2.545455).abs() < 1e-6);
    assert!((mk["p_value"].as_f64().unwrap() - 0.010914).abs() < 1e-6);
    assert_eq!(mk["sen_slope"], -0.5);
    // The demo checklist gives the small-spotted catshark 8 years: window max(10, 24) = 24.
    assert_eq!(report["generation_length"]["years"], 8.0);
    assert_eq!(report["trend"]["window_years"], 24.0);
}

#[test]
fn a_trend_without_a_generation_length_says_how_to_give_one() {
    let dir = tempfile::tempdir().unwrap();
    let file = write(dir.path(), "y.csv", "year,count,effort\n2001,3,1\n2002,4,1\n2003,5,1\n");
    let output = wrackline(dir.path(), &["trend", "--from", file.to_str().unwrap()]);
    assert!(!output.status.success());
    assert!(String::from_utf8_lossy(&output.stderr).contains("--generation-length"));
}

#[tokio::test]
async fn stored_records_count_only_in_the_chosen_review_state() {
    let app = spawn_app().await;
    for (id, lat) in [("9a1f0c52-8a47-4c1e-9a55-2b6f3c1d0e01", 52.41), ("9a1f0c52-8a47-4c1e-9a55-2b6f3c1d0e02", 52.30)]
    {
        let mut record = submission(id);
        record["position"]["latitude"] = lat.into();
        assert_eq!(app.submit(&record, &[]).await.status, 200);
    }
    let confirmed = json_of(&wrackline(&app.data_dir, &["range", "--json"]));
    assert_eq!(confirmed["records_read"], 0, "new records await review");
    assert_eq!(confirmed["records_used"], "stored records in review state confirmed");
    let any = json_of(&wrackline(&app.data_dir, &["range", "--state", "any", "--json"]));
    assert_eq!(any["records_used"], "stored records in any review state");
    let group = &any["taxa"][0];
    assert_eq!(
        group["taxon"], "Scyliorhinus canicula",
        "the guess `small-spotted catshark` is matched on the checklist"
    );
    assert_eq!(group["periods"][0]["records"], 2);
    let text = wrackline(&app.data_dir, &["range", "--state", "any"]);
    assert!(String::from_utf8_lossy(&text.stdout).contains("Records used: stored records in any review state"));
}

#[tokio::test]
async fn range_and_trend_over_http_give_the_figures_the_command_line_gives() {
    let app = spawn_app().await;
    for (i, year) in [2021, 2022, 2023, 2024].iter().enumerate() {
        let mut record = submission(&format!("9a1f0c52-8a47-4c1e-9a55-2b6f3c1d0f0{i}"));
        record["observed_at"] = format!("{year}-06-01T14:10:00+01:00").into();
        record["position"]["latitude"] = (52.2 + 0.05 * i as f64).into();
        assert_eq!(app.submit(&record, &[]).await.status, 200);
    }
    let over_http: Value = app.get("/api/range?state=any&taxon=Scyliorhinidae").await.json().await.unwrap();
    let from_cli =
        json_of(&wrackline(&app.data_dir, &["range", "--state", "any", "--taxon", "Scyliorhinidae", "--json"]));
    assert_eq!(over_http, from_cli);
    let trend = app.get("/api/trend?state=any&taxon=small-spotted%20catshark").await;
    assert_eq!(trend.status(), 200);
    let trend: Value = trend.json().await.unwrap();
    assert_eq!(trend["trend"]["window_years"], 24.0, "max(10, 3 × 8 years from the checklist)");
    assert!(trend["notes"][0].as_str().unwrap().contains("raw yearly counts"));
    let refused = app.get("/api/range?period=2019-2015").await;
    assert_eq!(refused.status(), 400);
}

/// A Darwin Core Archive as another system might write it: comma-separated and quoted,
/// one header line, the species name as a constant `default` (TDWG Darwin Core Text Guide).
fn archive_from_elsewhere(dir: &Path, rows: &str) -> std::path::PathBuf {
    use std::io::Write as _;
    let meta = r#"<?xml version="1.0" encoding="UTF-8"?>
<archive xmlns="http://rs.tdwg.org/dwc/text/">
  <core rowType="http://rs.tdwg.org/dwc/terms/Occurrence" fieldsTerminatedBy="," fieldsEnclosedBy="&quot;" ignoreHeaderLines="1" encoding="UTF-8">
    <files><location>data/points.csv</location></files>
    <id index="0"/>
    <field index="1" term="http://rs.tdwg.org/dwc/terms/eventDate"/>
    <field index="2" term="http://rs.tdwg.org/dwc/terms/decimalLongitude"/>
    <field index="3" term="http://rs.tdwg.org/dwc/terms/decimalLatitude"/>
    <field term="http://rs.tdwg.org/dwc/terms/scientificName" default="Dasyatis pastinaca"/>
  </core>
</archive>"#;
    let path = dir.join("elsewhere.zip");
    let mut zip = zip::ZipWriter::new(std::fs::File::create(&path).unwrap());
    let options = zip::write::SimpleFileOptions::default();
    zip.start_file("meta.xml", options).unwrap();
    zip.write_all(meta.as_bytes()).unwrap();
    zip.start_file("data/points.csv", options).unwrap();
    zip.write_all(rows.as_bytes()).unwrap();
    zip.finish().unwrap();
    path
}

#[test]
fn range_reads_an_archive_from_elsewhere_through_its_meta_xml() {
    let dir = tempfile::tempdir().unwrap();
    let rows = "id,date,lon,lat\n\"a, first\",2021-05-01,-4.10,52.40\nb,2021-06-01,-4.30,52.20\nc,2022,-4.60,52.10\n";
    let zip = archive_from_elsewhere(dir.path(), rows);
    let report = json_of(&wrackline(dir.path(), &["range", "--from", zip.to_str().unwrap(), "--json"]));
    let group = &report["taxa"][0];
    assert_eq!(group["taxon"], "Dasyatis pastinaca", "the constant from meta.xml");
    assert_eq!(group["periods"][0]["records"], 3);
    let hull = group["periods"][0]["figures"]["eoo"]["hull"].as_array().unwrap();
    assert!(
        hull.iter().any(|c| c["lat"] == 52.4 && c["lon"] == -4.1),
        "columns mapped by index, not by position in the file"
    );
}

#[test]
fn a_bad_cell_in_an_archive_is_named_by_its_file_line_and_column() {
    let dir = tempfile::tempdir().unwrap();
    let zip = archive_from_elsewhere(dir.path(), "id,date,lon,lat\na,2021-05-01,-4.10,52.40\nb,sometime,-4.30,52.20\n");
    let output = wrackline(dir.path(), &["range", "--from", zip.to_str().unwrap()]);
    assert!(!output.status.success());
    let message = String::from_utf8_lossy(&output.stderr);
    assert!(message.contains("elsewhere.zip:data/points.csv, line 3, column 2 (eventDate)"), "{message}");
}

#[tokio::test]
async fn the_map_and_the_chart_are_served_as_svg() {
    let app = spawn_app().await;
    for (i, year) in [2021, 2022, 2023, 2024].iter().enumerate() {
        let mut record = submission(&format!("9a1f0c52-8a47-4c1e-9a55-2b6f3c1d0a0{i}"));
        record["observed_at"] = format!("{year}-06-01T14:10:00+01:00").into();
        record["position"]["latitude"] = (52.2 + 0.05 * i as f64).into();
        assert_eq!(app.submit(&record, &[]).await.status, 200);
    }
    for path in ["/api/range/map.svg?state=any", "/api/trend/chart.svg?state=any&taxon=Scyliorhinus%20canicula"] {
        let response = app.get(path).await;
        assert_eq!(response.status(), 200, "{path}");
        assert_eq!(response.headers()["content-type"], "image/svg+xml");
        assert!(response.text().await.unwrap().starts_with("<svg"), "{path}");
    }
    assert_eq!(app.get("/api/range/map.svg").await.status(), 404, "nothing confirmed yet to map");
}

#[tokio::test]
async fn a_family_with_a_sensitive_species_is_figured_from_published_places_for_the_public() {
    let app = spawn_app().await;
    // The blue skate is "tenthDegree" in the demo checklist (Chapman 2020 category), so
    // its family, order and superorder show where it was only to signed-in reviewers;
    // the public's figures and maps are made from the records' places rounded to 0.1°.
    for (i, (lat, lon)) in [(52.41, -4.09), (52.24, -4.26), (52.13, -4.57)].iter().enumerate() {
        let id = format!("5e000000-0000-4000-8000-00000000000{i}");
        let mut skate = submission(&id);
        skate["species_guess"] = "Dipturus batis".into();
        skate["position"] =
            serde_json::json!({"latitude": lat, "longitude": lon, "accuracy_m": 10.0, "source": "device"});
        assert_eq!(app.submit(&skate, &[]).await.status, 200);
        app.confirm(&id, "Dipturus batis", "species").await;
    }
    let anonymous = |path: String| app.client.get(format!("{}{path}", app.base)).send();
    let on_grid = |v: &Value| ((v.as_f64().unwrap() * 10.0).round() / 10.0 - v.as_f64().unwrap()).abs() < 1e-9;
    for taxon in ["Rajidae", "Dipturus", "Rajiformes", "Batoidea"] {
        let query = format!("taxon={taxon}");
        let public: Value = anonymous(format!("/api/range?{query}")).await.unwrap().json().await.unwrap();
        let figures = &public["taxa"][0]["periods"][0]["figures"];
        assert!(figures["eoo_km2"].as_f64().unwrap() > 0.0, "{taxon}: the figures stay public");
        let hull = figures["eoo"]["hull"].as_array().unwrap();
        assert_eq!(hull.len(), 3, "{taxon}");
        assert!(hull.iter().all(|c| on_grid(&c["lat"]) && on_grid(&c["lon"])), "{taxon}: published places: {hull:?}");
        assert_eq!(anonymous(format!("/api/range/map.svg?{query}")).await.unwrap().status(), 200, "{taxon}: the map");
        let reviewer: Value = app.get(&format!("/api/range?{query}")).await.json().await.unwrap();
        let recorded = reviewer["taxa"][0]["periods"][0]["figures"]["eoo"]["hull"].as_array().unwrap().clone();
        assert!(recorded.iter().any(|c| c["lat"] == 52.41), "{taxon}: reviewers see them as recorded: {recorded:?}");
    }
}

/// One point set of the analysis crate's reference fixture (pyproj + shapely, see
/// `analysis/tests/reference/make_reference.py`).
fn reference_set(name: &str) -> Value {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/../analysis/tests/reference/range.json");
    let fixture: Value = serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap();
    fixture["sets"].as_array().unwrap().iter().find(|s| s["name"] == name).cloned().unwrap()
}

fn fixed_and_least(counts: &Value) -> (u64, u64) {
    let counts = counts.as_array().unwrap();
    let fixed =
        counts.iter().find(|c| c["east_quarters"] == 0 && c["north_quarters"] == 0).unwrap()["cells"].as_u64().unwrap();
    (fixed, counts.iter().map(|c| c["cells"].as_u64().unwrap()).min().unwrap())
}

#[test]
fn range_from_records_across_the_antimeridian_centres_its_grid_on_them() {
    let dir = tempfile::tempdir().unwrap();
    let set = reference_set("antimeridian_pacific");
    let mut csv = String::from("scientificName,decimalLatitude,decimalLongitude,eventDate\n");
    for point in set["points"].as_array().unwrap() {
        csv.push_str(&format!("Raja clavata,{},{},2020-05-01\n", point[0], point[1]));
    }
    let file = write(dir.path(), "pacific.csv", &csv);
    let from = file.to_str().unwrap();
    let eoo_reference = set["eoo_km2"].as_f64().unwrap();

    // The documented rule: far from 52° N 10° E, so centred on the records' mean rounded to 5°.
    let report = json_of(&wrackline(dir.path(), &["range", "--from", from, "--json"]));
    assert_eq!(
        report["grid"]["centre"],
        serde_json::json!({"lat": set["rule_centre"][0], "lon": set["rule_centre"][1]}),
        "{}",
        report["grid_choice"]
    );
    assert!(
        report["grid_choice"].as_str().unwrap().contains("these records lie more than 60° of arc"),
        "{}",
        report["grid_choice"]
    );
    let figures = &report["taxa"][0]["periods"][0]["figures"];
    // EOO: shapely hull + pyproj geodesic area in the [0, 360) frame (range.json).
    assert!(
        (figures["eoo_km2"].as_f64().unwrap() - eoo_reference).abs() < 1e-6 * eoo_reference,
        "{}",
        figures["eoo_km2"]
    );
    let (fixed, least) = fixed_and_least(&set["aoo_cells_by_shift_rule_grid"]);
    assert_eq!(
        (figures["aoo"]["occupied_cells"].as_u64(), figures["aoo"]["min_occupied_cells"].as_u64()),
        (Some(fixed), Some(least))
    );
    assert!(figures["method"].as_str().unwrap().contains("centred on -15°, 180°"), "{}", figures["method"]);

    // A centre given on the command line, the one the reference counted cells on.
    let given = json_of(&wrackline(dir.path(), &["range", "--from", from, "--grid-centre", "-17,179", "--json"]));
    assert_eq!(given["grid"]["centre"], serde_json::json!({"lat": -17.0, "lon": 179.0}));
    let figures = &given["taxa"][0]["periods"][0]["figures"];
    let (fixed, least) = fixed_and_least(&set["aoo_cells_by_shift"]);
    assert_eq!(
        (figures["aoo"]["occupied_cells"].as_u64(), figures["aoo"]["min_occupied_cells"].as_u64()),
        (Some(fixed), Some(least))
    );
    assert_eq!(figures["aoo"]["area_km2"].as_f64(), Some(fixed as f64 * 4.0));

    let refused = wrackline(dir.path(), &["range", "--from", from, "--grid-centre", "north"]);
    assert!(!refused.status.success());
    assert!(
        String::from_utf8_lossy(&refused.stderr).contains("`north` is not LAT,LON"),
        "{}",
        String::from_utf8_lossy(&refused.stderr)
    );
}

#[tokio::test]
async fn stored_records_keep_the_fixed_grid_and_take_a_centre_over_http() {
    let app = spawn_app().await;
    assert_eq!(app.submit(&submission("6d000000-0000-4000-8000-000000000001"), &[]).await.status, 200);
    let report: Value = app.get("/api/range?state=any").await.json().await.unwrap();
    assert_eq!(
        report["grid"]["centre"],
        serde_json::json!({"lat": 52.0, "lon": 10.0}),
        "the demo checklist's areas are near the default"
    );
    assert!(report["grid_choice"].as_str().unwrap().contains("fixed default"), "{}", report["grid_choice"]);
    let moved: Value = app.get("/api/range?state=any&grid_centre=52.4,-4.1").await.json().await.unwrap();
    assert_eq!(moved["grid"]["centre"], serde_json::json!({"lat": 52.4, "lon": -4.1}));
    assert!(moved["taxa"][0]["periods"][0]["figures"]["method"].as_str().unwrap().contains("centred on 52.4°, -4.1°"));
    let refused = app.get("/api/range?grid_centre=95,0").await;
    assert_eq!(refused.status(), 422);
    assert_eq!(refused.json::<Value>().await.unwrap()["field"], "grid_centre");
}
