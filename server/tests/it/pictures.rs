//! Maps and charts as SVG files from the command line, read back as XML (quick-xml) and
//! checked against the figures the same run reports.

use std::collections::HashMap;
use std::path::Path;
use std::process::Command;

use quick_xml::events::Event;
use serde_json::Value;

/// Counts elements by name, with the fill colour for shapes, after checking the file is XML.
fn elements(path: &Path) -> HashMap<String, usize> {
    let text = std::fs::read_to_string(path).unwrap();
    let mut reader = quick_xml::Reader::from_str(&text);
    let mut counts = HashMap::new();
    loop {
        match reader.read_event().expect("the SVG is well-formed XML") {
            Event::Start(tag) | Event::Empty(tag) => {
                let name = tag.local_name().as_ref().to_owned();
                let fill = tag.try_get_attribute("fill").unwrap().map(|a| a.value.to_string());
                *counts.entry(name.clone()).or_insert(0) += 1;
                if let Some(fill) = fill {
                    *counts.entry(format!("{name} {fill}")).or_insert(0) += 1;
                }
            }
            Event::Eof => break,
            _ => {}
        }
    }
    counts
}

fn run(args: &[&str]) -> Value {
    let output = Command::new(env!("CARGO_BIN_EXE_wrackline")).args(args).output().unwrap();
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    serde_json::from_slice(&output.stdout).unwrap()
}

#[test]
fn the_range_map_draws_every_record_every_occupied_cell_the_hull_and_the_coast() {
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("records.csv");
    // Invented records along the Cardigan Bay coast, two of them in one 2 km cell.
    std::fs::write(
        &csv,
        "scientificName,decimalLatitude,decimalLongitude\nRaja clavata,52.4153,-4.0829\nRaja clavata,52.4160,-4.0835\n\
         Raja clavata,52.2430,-4.2610\nRaja clavata,52.1390,-4.4870\nRaja clavata,52.3080,-4.1515\n",
    )
    .unwrap();
    let svg = dir.path().join("map.svg");
    let report = run(&["range", "--json", "--from", csv.to_str().unwrap(), "--svg", svg.to_str().unwrap()]);
    let figures = &report["taxa"][0]["periods"][0]["figures"];
    let counts = elements(&svg);
    assert_eq!(counts["circle"], 5, "one dot per record");
    assert_eq!(
        counts["rect #e9a23b"],
        figures["aoo"]["occupied_cells"].as_u64().unwrap() as usize,
        "one square per occupied cell"
    );
    assert_eq!(counts["polygon"], 1, "the hull");
    assert_eq!(counts.get("path #dcd6c4"), Some(&1), "the bundled coastline");
    let text = std::fs::read_to_string(&svg).unwrap();
    assert!(text.contains("not a listing decision"));
}

#[test]
fn the_trend_chart_draws_a_point_per_year_the_fitted_line_and_its_band() {
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("years.csv");
    let counts = [14, 12, 15, 11, 9, 10, 8, 9, 6, 7, 5];
    let mut text = String::from("year,count,effort\n");
    for (i, c) in counts.iter().enumerate() {
        text.push_str(&format!("{},{c},{}\n", 2014 + i, 10 + i));
    }
    std::fs::write(&csv, text).unwrap();
    let svg = dir.path().join("trend.svg");
    run(&[
        "trend",
        "--json",
        "--from",
        csv.to_str().unwrap(),
        "--generation-length",
        "6",
        "--svg",
        svg.to_str().unwrap(),
    ]);
    let counts_seen = elements(&svg);
    assert_eq!(counts_seen["circle"], counts.len());
    assert_eq!(counts_seen["polyline"], 1, "the fitted line");
    assert_eq!(counts_seen["polygon"], 1, "the 95% band");
}
