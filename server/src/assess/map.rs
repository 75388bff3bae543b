//! A map of one taxon's records as SVG: the bundled coastline, the occupied AOO cells and
//! the EOO hull, one panel per period, side by side.
//!
//! Everything is drawn in the AOO grid's own Lambert azimuthal equal-area projection, so
//! the cells are true squares and areas look as large as they are. The coastline is
//! Natural Earth 1:10m land (public domain) for the Irish Sea region, compiled in (see
//! `server/assets/README.md`), so maps work offline; outside that region the map shows
//! records, cells and hull on open background.

use std::collections::BTreeSet;
use std::fmt::Write as _;

use analysis::LatLon;
use analysis::range::AooGrid;

use super::range::{PeriodRange, TaxonRange};

const COASTLINE: &str = include_str!("../../assets/coastline-irish-sea.geojson");
const PANEL: f64 = 420.0;
const MARGIN: f64 = 16.0;
const HEADER: f64 = 54.0;
const FOOTER: f64 = 128.0;

/// Projected bounds in metres: west, south, east, north.
#[derive(Debug, Clone, Copy)]
struct Extent {
    west: f64,
    south: f64,
    east: f64,
    north: f64,
}

impl Extent {
    fn around(points: &[[f64; 2]]) -> Option<Self> {
        Self::around_at_least(points, 20_000.0)
    }

    /// Square bounds around the points, at least `min_side_m` across, plus a margin.
    fn around_at_least(points: &[[f64; 2]], min_side_m: f64) -> Option<Self> {
        let first = points.first()?;
        let mut e = Extent { west: first[0], south: first[1], east: first[0], north: first[1] };
        for p in points {
            e.west = e.west.min(p[0]);
            e.east = e.east.max(p[0]);
            e.south = e.south.min(p[1]);
            e.north = e.north.max(p[1]);
        }
        // At least the given size across, plus a margin, and square so panels match.
        let side = (e.east - e.west).max(e.north - e.south).max(min_side_m) * 1.2;
        let (cx, cy) = ((e.west + e.east) / 2.0, (e.south + e.north) / 2.0);
        Some(Extent { west: cx - side / 2.0, east: cx + side / 2.0, south: cy - side / 2.0, north: cy + side / 2.0 })
    }

    fn scale(&self) -> f64 {
        PANEL / (self.east - self.west)
    }

    /// SVG x, y inside a panel (y grows downwards).
    fn to_panel(self, [x, y]: [f64; 2]) -> (f64, f64) {
        ((x - self.west) * self.scale(), (self.north - y) * self.scale())
    }
}

/// The map of one taxon as a complete SVG document.
pub fn taxon_map(taxon: &TaxonRange, grid: &AooGrid) -> String {
    let project = |p: &LatLon| grid.project(*p).ok();
    let all: Vec<[f64; 2]> = taxon.periods.iter().flat_map(|p| p.points.iter().filter_map(project)).collect();
    let extent =
        Extent::around(&all).unwrap_or(Extent { west: -10_000.0, south: -10_000.0, east: 10_000.0, north: 10_000.0 });
    let panels = taxon.periods.len().max(1) as f64;
    let width = MARGIN + panels * (PANEL + MARGIN);
    let height = HEADER + PANEL + FOOTER;
    let mut svg = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{width:.0}\" height=\"{height:.0}\" viewBox=\"0 0 {width:.0} {height:.0}\" \
         font-family=\"system-ui, sans-serif\" font-size=\"12\">\n<rect width=\"100%\" height=\"100%\" fill=\"#fbfaf6\"/>\n\
         <text x=\"{MARGIN}\" y=\"24\" font-size=\"17\" font-weight=\"600\" fill=\"#1f2a36\">{}</text>\n\
         <text x=\"{MARGIN}\" y=\"42\" fill=\"#4a5561\">Records, occupied 2 × 2 km cells (AOO), convex hull (EOO)</text>\n",
        escape(&taxon.taxon)
    );
    let coast = coastline_path(grid, &extent);
    for (i, period) in taxon.periods.iter().enumerate() {
        let x = MARGIN + i as f64 * (PANEL + MARGIN);
        svg.push_str(&panel(period, grid, &extent, &coast, x, i));
    }
    let _ = write!(
        svg,
        "<text x=\"{MARGIN}\" y=\"{:.0}\" fill=\"#4a5561\">Equal-area grid (Lambert azimuthal) centred on {}° N, {}° E.</text>\n\
         <text x=\"{MARGIN}\" y=\"{:.0}\" fill=\"#4a5561\">Coastline: Natural Earth 1:10m (public domain).</text>\n\
         <text class=\"caveat\" x=\"{MARGIN}\" y=\"{:.0}\" fill=\"#8a4b2d\">Inputs to an assessment, not a listing decision;</text>\n\
         <text class=\"caveat\" x=\"{MARGIN}\" y=\"{:.0}\" fill=\"#8a4b2d\">stranding and landing records show where people look.</text>\n</svg>\n",
        HEADER + PANEL + 60.0,
        grid.centre().lat(),
        grid.centre().lon(),
        HEADER + PANEL + 76.0,
        HEADER + PANEL + 96.0,
        HEADER + PANEL + 112.0,
    );
    svg
}

fn panel(period: &PeriodRange, grid: &AooGrid, extent: &Extent, coast: &str, x: f64, index: usize) -> String {
    let mut g = format!(
        "<g transform=\"translate({x:.1},{HEADER})\">\n<clipPath id=\"panel{index}\"><rect width=\"{PANEL}\" height=\"{PANEL}\"/></clipPath>\n\
         <rect width=\"{PANEL}\" height=\"{PANEL}\" fill=\"#e6eff3\" stroke=\"#9fb3bf\"/>\n<g clip-path=\"url(#panel{index})\">\n\
         <path d=\"{coast}\" fill=\"#dcd6c4\" stroke=\"#a39c86\" stroke-width=\"0.6\" fill-rule=\"evenodd\"/>\n"
    );
    let size_m = grid.cell_size_km() * 1000.0;
    let cells: BTreeSet<(i64, i64)> = period
        .points
        .iter()
        .filter_map(|p| grid.project(*p).ok())
        .map(|[e, n]| ((e / size_m).floor() as i64, (n / size_m).floor() as i64))
        .collect();
    for (i, j) in &cells {
        let (left, top) = extent.to_panel([*i as f64 * size_m, (*j + 1) as f64 * size_m]);
        let side = size_m * extent.scale();
        let _ = writeln!(
            g,
            "<rect x=\"{left:.2}\" y=\"{top:.2}\" width=\"{side:.2}\" height=\"{side:.2}\" fill=\"#e9a23b\" fill-opacity=\"0.45\" stroke=\"#b9771a\" stroke-width=\"0.8\"/>"
        );
    }
    if let Some(figures) = &period.figures {
        let corners: Vec<String> = figures
            .eoo
            .hull
            .iter()
            .filter_map(|c| grid.project(*c).ok())
            .map(|p| {
                let (px, py) = extent.to_panel(p);
                format!("{px:.2},{py:.2}")
            })
            .collect();
        if corners.len() >= 3 {
            let _ = writeln!(
                g,
                "<polygon points=\"{}\" fill=\"#2f5d8a\" fill-opacity=\"0.08\" stroke=\"#2f5d8a\" stroke-width=\"1.4\" stroke-dasharray=\"6 3\"/>",
                corners.join(" ")
            );
        }
    }
    for p in period.points.iter().filter_map(|p| grid.project(*p).ok()) {
        let (px, py) = extent.to_panel(p);
        let _ = writeln!(
            g,
            "<circle cx=\"{px:.2}\" cy=\"{py:.2}\" r=\"3.2\" fill=\"#1c3b57\" stroke=\"#fff\" stroke-width=\"1\"/>"
        );
    }
    g.push_str("</g>\n");
    g.push_str(&scale_bar(extent));
    let (first, second) = match &period.figures {
        Some(f) => (
            format!("{}: {} records at {} sites", period.period, period.records, period.sites),
            format!(
                "EOO {:.0} km²{} · AOO {:.0} km² (least over shifted grids {:.0} km²)",
                f.eoo_km2,
                if f.eoo_raised_to_aoo { " (raised to AOO)" } else { "" },
                f.aoo.area_km2,
                f.aoo.min_area_km2
            ),
        ),
        None => (format!("{}: no records with a position", period.period), String::new()),
    };
    let _ = writeln!(
        g,
        "<text y=\"{:.0}\" fill=\"#1f2a36\" font-weight=\"600\">{}</text>\n<text y=\"{:.0}\" fill=\"#1f2a36\">{}</text>\n</g>",
        PANEL + 18.0,
        escape(&first),
        PANEL + 34.0,
        escape(&second)
    );
    g
}

fn scale_bar(extent: &Extent) -> String {
    let width_km = (extent.east - extent.west) / 1000.0;
    let bar_km = [1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0, 200.0, 500.0]
        .into_iter()
        .rev()
        .find(|k| *k <= width_km / 4.0)
        .unwrap_or(1.0);
    let length = bar_km * 1000.0 * extent.scale();
    format!(
        "<g transform=\"translate(12,{:.0})\"><rect x=\"-4\" y=\"-14\" width=\"{:.1}\" height=\"22\" fill=\"#fbfaf6\" fill-opacity=\"0.8\"/>\
         <line x1=\"0\" x2=\"{length:.1}\" y1=\"0\" y2=\"0\" stroke=\"#1f2a36\" stroke-width=\"2\"/>\
         <text x=\"{:.1}\" y=\"-3\" fill=\"#1f2a36\">{bar_km:.0} km</text></g>\n",
        PANEL - 12.0,
        length + 48.0,
        length + 6.0,
    )
}

/// The coastline as one SVG path in panel coordinates; rings wholly outside the extent are left out.
fn coastline_path(grid: &AooGrid, extent: &Extent) -> String {
    coastline_path_at(grid, extent, extent.scale())
}

/// The coastline as one SVG path at `scale` pixels per metre from the extent's north-west corner.
fn coastline_path_at(grid: &AooGrid, extent: &Extent, scale: f64) -> String {
    let Ok(collection) = serde_json::from_str::<serde_json::Value>(COASTLINE) else { return String::new() };
    let mut path = String::new();
    let polygons = collection["features"][0]["geometry"]["coordinates"].as_array().cloned().unwrap_or_default();
    for ring in polygons.iter().filter_map(|p| p.as_array()).flatten().filter_map(|r| r.as_array()) {
        let projected: Vec<[f64; 2]> = ring
            .iter()
            .filter_map(|c| LatLon::new(c[1].as_f64()?, c[0].as_f64()?).ok())
            .filter_map(|p| grid.project(p).ok())
            .collect();
        let overlaps = projected.iter().any(|p| {
            p[0] > extent.west - 50_000.0
                && p[0] < extent.east + 50_000.0
                && p[1] > extent.south - 50_000.0
                && p[1] < extent.north + 50_000.0
        });
        if projected.len() < 3 || !overlaps {
            continue;
        }
        for (i, p) in projected.iter().enumerate() {
            let (x, y) = ((p[0] - extent.west) * scale, (extent.north - p[1]) * scale);
            let _ = write!(path, "{}{x:.1} {y:.1}", if i == 0 { "M" } else { "L" });
        }
        path.push('Z');
    }
    path
}

/// One thing to mark on a record's map.
#[derive(Debug, Clone)]
pub struct MapPoint {
    pub label: String,
    pub position: LatLon,
    /// Drawn as a circle of this radius, in metres.
    pub uncertainty_m: Option<f64>,
    pub colour: &'static str,
}

/// A small map of one record for reviewers: where the phone put it (with its
/// uncertainty), where its photos say they were taken, and other reports that may be the
/// same animal, over the coastline, with a legend.
pub fn place_map(title: &str, points: &[MapPoint], grid: &AooGrid) -> String {
    const SIDE: f64 = 320.0;
    let projected: Vec<(&MapPoint, [f64; 2])> =
        points.iter().filter_map(|p| grid.project(p.position).ok().map(|xy| (p, xy))).collect();
    let xy: Vec<[f64; 2]> = projected.iter().map(|(_, xy)| *xy).collect();
    let extent = Extent::around_at_least(&xy, 3_000.0).unwrap_or(Extent {
        west: -1_500.0,
        south: -1_500.0,
        east: 1_500.0,
        north: 1_500.0,
    });
    let scale = SIDE / (extent.east - extent.west);
    let legend_height = 18.0 * points.len() as f64 + 12.0;
    let mut svg = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{SIDE}\" height=\"{h:.0}\" viewBox=\"0 0 {SIDE} {h:.0}\" font-family=\"system-ui, sans-serif\" font-size=\"11\">\n\
         <title>{}</title>\n<clipPath id=\"place\"><rect width=\"{SIDE}\" height=\"{SIDE}\"/></clipPath>\n\
         <rect width=\"{SIDE}\" height=\"{SIDE}\" fill=\"#e6eff3\" stroke=\"#9fb3bf\"/>\n<g clip-path=\"url(#place)\">\n\
         <path d=\"{}\" fill=\"#dcd6c4\" stroke=\"#a39c86\" stroke-width=\"0.6\" fill-rule=\"evenodd\"/>\n",
        escape(title),
        coastline_path_at(grid, &extent, scale),
        h = SIDE + legend_height,
    );
    for (point, xy) in &projected {
        let (px, py) = ((xy[0] - extent.west) * scale, (extent.north - xy[1]) * scale);
        if let Some(radius) = point.uncertainty_m {
            let _ = writeln!(
                svg,
                "<circle cx=\"{px:.1}\" cy=\"{py:.1}\" r=\"{:.1}\" fill=\"{}\" fill-opacity=\"0.15\" stroke=\"{}\"/>",
                radius * scale,
                point.colour,
                point.colour
            );
        }
        let _ = writeln!(
            svg,
            "<circle cx=\"{px:.1}\" cy=\"{py:.1}\" r=\"4\" fill=\"{}\" stroke=\"#fff\" stroke-width=\"1.2\"/>",
            point.colour
        );
    }
    svg.push_str("</g>\n");
    svg.push_str(&scale_bar_at(&extent, scale, SIDE));
    for (i, point) in points.iter().enumerate() {
        let y = SIDE + 18.0 * (i as f64 + 1.0);
        let _ = writeln!(
            svg,
            "<circle cx=\"10\" cy=\"{:.0}\" r=\"4\" fill=\"{}\"/><text x=\"20\" y=\"{:.0}\" fill=\"#1f2a36\">{}</text>",
            y - 4.0,
            point.colour,
            y,
            escape(&point.label)
        );
    }
    svg.push_str("</svg>\n");
    svg
}

fn scale_bar_at(extent: &Extent, scale: f64, side: f64) -> String {
    let width_m = extent.east - extent.west;
    let bar_m = [100.0, 200.0, 500.0, 1_000.0, 2_000.0, 5_000.0, 10_000.0]
        .into_iter()
        .rev()
        .find(|m| *m <= width_m / 4.0)
        .unwrap_or(100.0);
    let length = bar_m * scale;
    let label = if bar_m >= 1_000.0 { format!("{:.0} km", bar_m / 1000.0) } else { format!("{bar_m:.0} m") };
    format!(
        "<g transform=\"translate(10,{:.0})\"><line x1=\"0\" x2=\"{length:.1}\" y1=\"0\" y2=\"0\" stroke=\"#1f2a36\" stroke-width=\"2\"/><text x=\"{:.1}\" y=\"-3\" fill=\"#1f2a36\">{label}</text></g>\n",
        side - 10.0,
        length + 6.0
    )
}

/// Escapes text for SVG.
pub fn escape(text: &str) -> String {
    text.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}
