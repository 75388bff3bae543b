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
    // Records per year, later against earlier, with the periods' lengths in days ÷ 365.25
    // (1,826 and 1,827): scipy.stats.binomtest(3, 5, share of years) gives p = 1 and the
    // Clopper–Pearson interval that makes a rate ratio of 0.1717 to 17.949 around 1.4992.
    let records = &change["comparison"]["records"];
    let close = |key: &str, want: f64| {
        let got = records[key].as_f64().unwrap();
        assert!((got - want).abs() < 1e-4 * want, "{key}: {got} vs {want}");
    };
    close("rate_ratio", 1.499_179);
    close("lower", 0.171_734);
    close("upper", 17.949_33);
    close("p_value", 1.0);
    let text = change["comparison"]["text"].as_str().unwrap();
    assert!(text.contains("at 2 records each"), "{text}");
    assert!(text.contains("no clear change"), "{text}");
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

/// One yearly series of the analysis crate's trend fixture (statsmodels, see
/// `analysis/tests/reference/make_reference.py`), as a `year,count,effort` file.
fn reference_series(dir: &Path, name: &str) -> (std::path::PathBuf, Value) {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/../analysis/tests/reference/trend.json");
    let fixture: Value = serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap();
    let series = fixture["yearly"].as_array().unwrap().iter().find(|s| s["name"] == name).cloned().unwrap();
    let mut csv = String::from("year,count,effort\n");
    for k in 0..series["years"].as_array().unwrap().len() {
        csv.push_str(&format!("{},{},{}\n", series["years"][k], series["counts"][k], series["effort"][k]));
    }
    (write(dir, &format!("{name}.csv"), &csv), series)
}

#[test]
fn a_long_series_is_fitted_on_its_most_recent_window() {
    let dir = tempfile::tempdir().unwrap();
    // Forty years whose last ten fell by three quarters, generation length 3: criterion A's
    // window is the last 10 years (IUCN Criteria v3.1); statsmodels fitted on 2014–2024
    // gives the window change in trend.json, within the Endangered band for A2.
    let (file, series) = reference_series(dir.path(), "forty_years_last_ten_falling");
    let args = ["trend", "--from", file.to_str().unwrap(), "--generation-length", "3"];
    let report = json_of(&wrackline(dir.path(), &[&args[..], &["--json"]].concat()));
    let trend = &report["trend"];
    assert_eq!((trend["first_year"].as_i64(), trend["last_year"].as_i64()), (Some(2014), Some(2024)));
    let want = series["expected"]["window_change"][0].as_f64().unwrap();
    let got = trend["window_change"]["estimate"].as_f64().unwrap();
    assert!((got - want).abs() < 1e-5 * want.abs(), "{got} vs statsmodels {want}");
    assert_eq!(trend["criterion_a"]["a2_to_a4_band"], "Endangered");
    let text = String::from_utf8_lossy(&wrackline(dir.path(), &args).stdout).into_owned();
    assert!(text.contains("fitted on 2014–2024"), "{text}");
    assert!(text.contains("(before the window: not fitted)"), "{text}");
}

#[test]
fn finds_in_one_year_are_refused_with_the_reason_in_words() {
    let dir = tempfile::tempdir().unwrap();
    let file = write(dir.path(), "one.csv", "year,count,effort\n2020,0,5\n2021,0,5\n2022,0,5\n2023,0,5\n2024,7,5\n");
    let output = wrackline(dir.path(), &["trend", "--from", file.to_str().unwrap(), "--generation-length", "8"]);
    assert!(!output.status.success());
    let message = String::from_utf8_lossy(&output.stderr);
    assert!(message.contains("all 7 animals in 2020–2024 were found in one year (2024)"), "{message}");
    assert!(!message.contains("linear combination"), "{message}");
}

#[test]
fn three_years_are_not_stretched_over_a_24_year_window() {
    let dir = tempfile::tempdir().unwrap();
    // Before: +71,728,862,701% "over 24 years" and a band taken from the point estimate.
    let file = write(dir.path(), "three.csv", "year,count,effort\n2022,1,1\n2023,3,1\n2024,20,1\n");
    let args = ["trend", "--from", file.to_str().unwrap(), "--generation-length", "8"];
    let report = json_of(&wrackline(dir.path(), &[&args[..], &["--json"]].concat()));
    assert_eq!(report["trend"]["window_change"], Value::Null);
    assert_eq!(report["trend"]["criterion_a"]["a2_to_a4_band"], Value::Null);
    let text = String::from_utf8_lossy(&wrackline(dir.path(), &args).stdout).into_owned();
    assert!(text.contains("does not carry a trend that far beyond its data"), "{text}");
    assert!(!text.contains("71,728"), "{text}");
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
        let places = public["taxa"][0]["periods"][0]["influential_places"].as_array().unwrap();
        assert_eq!(places.len(), 3, "{taxon}: every corner");
        assert!(
            places.iter().all(|p| on_grid(&p["position"]["lat"]) && on_grid(&p["position"]["lon"])),
            "{taxon}: places to check at their published places: {places:?}"
        );
        assert_eq!(anonymous(format!("/api/range/map.svg?{query}")).await.unwrap().status(), 200, "{taxon}: the map");
        let reviewer: Value = app.get(&format!("/api/range?{query}")).await.json().await.unwrap();
        let recorded = reviewer["taxa"][0]["periods"][0]["figures"]["eoo"]["hull"].as_array().unwrap().clone();
        assert!(recorded.iter().any(|c| c["lat"] == 52.41), "{taxon}: reviewers see them as recorded: {recorded:?}");
        let places = reviewer["taxa"][0]["periods"][0]["influential_places"].as_array().unwrap();
        assert!(places.iter().any(|p| p["position"]["lat"] == 52.41), "{taxon}: as recorded: {places:?}");
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
    let expected = &set["expected"];
    let eoo_reference = expected["eoo_km2"].as_f64().unwrap();

    // The documented rule per taxon: far from 52° N 10° E, so centred on the records' mean
    // rounded to 5° (range.json, the rule written again in numpy).
    let report = json_of(&wrackline(dir.path(), &["range", "--from", from, "--json"]));
    assert_eq!(report["grid"], Value::Null, "a file's grids are chosen per taxon");
    let zone = &expected["zones"][0];
    let centre = &report["taxa"][0]["grids"][0]["centre"];
    assert_eq!([centre["lat"].clone(), centre["lon"].clone()], [zone["centre"][0].clone(), zone["centre"][1].clone()]);
    assert!(report["grid_choice"].as_str().unwrap().contains("chosen per taxon"), "{}", report["grid_choice"]);
    let figures = &report["taxa"][0]["periods"][0]["figures"];
    // EOO: qhull's hull of the unit vectors measured by pyproj.Geod on WGS84 (range.json).
    assert!(
        (figures["eoo_km2"].as_f64().unwrap() - eoo_reference).abs() < 1e-6 * eoo_reference,
        "{}",
        figures["eoo_km2"]
    );
    let (fixed, least) = fixed_and_least(&zone["cells_by_shift"]);
    assert_eq!(
        (figures["aoo"]["occupied_cells"].as_u64(), figures["aoo"]["min_occupied_cells"].as_u64()),
        (Some(fixed), Some(least))
    );
    assert!(figures["method"].as_str().unwrap().contains("centred on -15°, 180°"), "{}", figures["method"]);

    // A centre given on the command line: cells on it from pyproj laea + numpy (range.json).
    let given = json_of(&wrackline(dir.path(), &["range", "--from", from, "--grid-centre", "-17,179", "--json"]));
    assert_eq!(given["grid"]["centre"], serde_json::json!({"lat": -17.0, "lon": 179.0}));
    let figures = &given["taxa"][0]["periods"][0]["figures"];
    let (fixed, least) = fixed_and_least(&expected["cells_on_grid_at_-17_179"]);
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

#[test]
fn one_far_away_record_stops_no_taxon_and_a_taxon_round_the_globe_gets_its_aoo() {
    let dir = tempfile::tempdir().unwrap();
    // A coast of thornback rays, one spurdog on the far side of the globe, and blue sharks
    // round the world: before, the one grid for the whole file refused the far records and
    // the run stopped for every taxon.
    let mut csv = String::from("occurrenceID,scientificName,decimalLatitude,decimalLongitude,eventDate\n");
    for i in 0..20 {
        csv.push_str(&format!(
            "ray-{i},Raja clavata,{},{},2020-06-01\n",
            52.0 + 0.02 * f64::from(i),
            -4.0 - 0.03 * f64::from(i)
        ));
    }
    csv.push_str("dogfish-1,Squalus acanthias,-40.0,174.0,2021-03-01\n");
    for (i, (lat, lon)) in
        [(50, -5), (35, 140), (-34, 18), (-33, 151), (20, -157), (40, -70), (-23, -43)].iter().enumerate()
    {
        csv.push_str(&format!("blue-{i},Prionace glauca,{lat},{lon},2021-01-01\n"));
    }
    let file = write(dir.path(), "far.csv", &csv);
    let report = json_of(&wrackline(dir.path(), &["range", "--from", file.to_str().unwrap(), "--json"]));
    let taxon = |name: &str| report["taxa"].as_array().unwrap().iter().find(|t| t["taxon"] == name).unwrap().clone();
    let rays = taxon("Raja clavata");
    assert_eq!(
        rays["grids"][0]["centre"],
        serde_json::json!({"lat": 52.0, "lon": 10.0}),
        "the regional set keeps the default grid"
    );
    assert!(rays["periods"][0]["figures"]["eoo_km2"].as_f64().unwrap() > 0.0);
    let dogfish = taxon("Squalus acanthias");
    assert_eq!(dogfish["periods"][0]["figures"]["aoo"]["area_km2"], 4.0, "one record, one cell, on a grid of its own");
    let sharks = taxon("Prionace glauca");
    let figures = &sharks["periods"][0]["figures"];
    // Seven records more than 60° apart: each its own zone, one cell each (IUCN 2 × 2 km cells).
    assert_eq!(figures["aoo"]["area_km2"], 28.0);
    assert!(sharks["grids"].as_array().unwrap().len() >= 3, "{}", sharks["grids"]);
    assert_eq!(figures["eoo_km2"], Value::Null, "no hemisphere holds them");
    assert!(figures["eoo_problem"].as_str().unwrap().contains("do not lie within one hemisphere"));
    let text = wrackline(dir.path(), &["range", "--from", file.to_str().unwrap()]);
    assert!(text.status.success());
    assert!(String::from_utf8_lossy(&text.stdout).contains("not given"), "{}", String::from_utf8_lossy(&text.stdout));
}

#[test]
fn a_stray_record_is_listed_for_review_by_its_id_beside_the_figures() {
    let dir = tempfile::tempdir().unwrap();
    // Records along 200 km of coast and one with its longitude mistyped, far inland.
    let mut csv = String::from("occurrenceID,scientificName,decimalLatitude,decimalLongitude,eventDate\n");
    for i in 0..30 {
        csv.push_str(&format!(
            "coast-{i},Raja clavata,{},{},2020-06-01\n",
            50.2 + 0.01 * f64::from(i % 5),
            -5.5 + 0.1 * f64::from(i)
        ));
    }
    csv.push_str("stray-1,Raja clavata,50.3,8.1,2020-06-02\n");
    let file = write(dir.path(), "stray.csv", &csv);
    let report = json_of(&wrackline(dir.path(), &["range", "--from", file.to_str().unwrap(), "--json"]));
    let period = &report["taxa"][0]["periods"][0];
    let outliers = period["outliers"].as_array().unwrap();
    assert_eq!(outliers.len(), 1, "{outliers:?}");
    assert_eq!(outliers[0]["records"], serde_json::json!(["stray-1"]));
    // Great-circle distance on the mean Earth radius (6,371.0088 km) from (50.3, 8.1) to the
    // nearest coast record: 759.85 km (the haversine formula in Python's math module).
    let nearest = outliers[0]["nearest_km"].as_f64().unwrap();
    assert!((nearest - 759.85).abs() < 0.01, "{nearest}");
    let with = period["figures"]["eoo_km2"].as_f64().unwrap();
    let without = period["eoo_km2_without_outliers"].as_f64().unwrap();
    assert!(without < with / 2.0, "the stray record more than doubles the hull: {without} vs {with}");
    let influential = period["influential_places"].as_array().unwrap();
    assert_eq!(influential[0]["records"], serde_json::json!(["stray-1"]), "the stray record is checked first");
    assert!(period["stability"]["text"].as_str().unwrap().contains("Resampling the records 200 times"));
    assert!(period["location_guide"]["text"].as_str().unwrap().contains("guide only"));
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
    for bad in ["cluster_km=-3", "outlier_km=far"] {
        let refused = app.get(&format!("/api/range?{bad}")).await;
        assert_eq!(refused.status(), 422, "{bad}");
        let body: Value = refused.json().await.unwrap();
        assert!(body.to_string().contains("is not a distance between 0.001 and 20000 km"), "{body}");
    }
    assert_eq!(refused.json::<Value>().await.unwrap()["field"], "grid_centre");
}
