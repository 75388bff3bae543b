//! Simple pictures of what each key question asks about, drawn for wrackline as SVG
//! so they work offline and stay sharp on any screen. The part a question is about is
//! drawn in the highlight colour. A state with no picture shows its words alone.

const BODY: &str = "#6b7b80";
const MARK: &str = "#e07a1f";

/// A fish seen from the side, with the parts a question may ask about.
#[derive(Clone, Copy)]
struct Side {
    dorsal: Fin,
    second: Fin,
    anal: bool,
    spines: (bool, bool),
    tail: Tail,
    gills: usize,
    highlight: Part,
}

#[derive(Clone, Copy, PartialEq)]
enum Fin {
    None,
    Tall,
    Small,
    LongLow,
}

#[derive(Clone, Copy, PartialEq)]
enum Tail {
    Asymmetric,
    Crescent,
    Rounded,
    Filament,
    Thresher,
    LowerLonger,
    Missing,
}

#[derive(Clone, Copy, PartialEq)]
enum Part {
    Dorsals,
    Anal,
    Spines,
    Tail,
    Gills,
}

const PLAIN_SHARK: Side = Side {
    dorsal: Fin::Tall,
    second: Fin::Small,
    anal: true,
    spines: (false, false),
    tail: Tail::Asymmetric,
    gills: 5,
    highlight: Part::Dorsals,
};

fn colour(side: &Side, part: Part) -> &'static str {
    if side.highlight == part { MARK } else { BODY }
}

fn svg(content: &str) -> String {
    format!(r#"<svg viewBox="0 0 120 60" width="120" height="60" aria-hidden="true">{content}</svg>"#)
}

fn tail_path(tail: Tail) -> &'static str {
    match tail {
        Tail::Asymmetric => "M94 29 L116 12 L108 32 L114 41 L94 35 Z",
        Tail::Crescent => "M94 29 L114 8 L106 32 L114 56 L94 35 Z",
        Tail::Rounded => "M94 28 Q119 18 117 32 Q119 46 94 36 Z",
        Tail::Filament => "M94 31 L119 32 L94 34 Z",
        Tail::Thresher => "M90 29 L119 2 L100 32 L108 40 L90 35 Z",
        Tail::LowerLonger => "M94 29 L108 20 L104 32 L116 48 L94 35 Z",
        Tail::Missing => "M94 31 L100 32 L94 34 Z",
    }
}

fn fin_path(fin: Fin, first: bool) -> Option<&'static str> {
    match (fin, first) {
        (Fin::None, _) => None,
        (Fin::Tall, true) => Some("M38 23 L48 6 L57 24 Z"),
        (Fin::Tall, false) => Some("M67 25 L75 10 L83 27 Z"),
        (Fin::Small, true) => Some("M42 23 L47 15 L53 24 Z"),
        (Fin::Small, false) => Some("M70 25 L75 17 L81 27 Z"),
        (Fin::LongLow, _) => Some("M60 25 Q74 16 88 28 Z"),
    }
}

fn side_view(side: Side) -> String {
    let mut parts = vec![format!(
        r#"<path d="M6 32 Q12 21 32 22 L84 26 Q92 28 96 30 L96 34 Q88 37 78 38 L30 40 Q10 40 6 32 Z" fill="{BODY}"/>"#
    )];
    parts.push(format!(r#"<path d="{}" fill="{}"/>"#, tail_path(side.tail), colour(&side, Part::Tail)));
    for (fin, first) in [(side.dorsal, true), (side.second, false)] {
        if let Some(path) = fin_path(fin, first) {
            parts.push(format!(r#"<path d="{path}" fill="{}"/>"#, colour(&side, Part::Dorsals)));
        }
    }
    let spine_at = [(side.spines.0, "M39 23 L45 5"), (side.spines.1, "M68 25 L73 9")];
    for (present, path) in spine_at {
        if present {
            parts.push(format!(r#"<path d="{path}" stroke="{}" stroke-width="2.5"/>"#, colour(&side, Part::Spines)));
        }
    }
    if side.anal {
        parts.push(format!(r#"<path d="M72 38 L78 47 L83 37 Z" fill="{}"/>"#, colour(&side, Part::Anal)));
    }
    parts.push(format!(r#"<path d="M54 39 L60 46 L63 39 Z" fill="{BODY}"/>"#));
    let gill_colour = colour(&side, Part::Gills);
    for i in 0..side.gills {
        let x = 22 + i * 3;
        parts.push(format!(r#"<path d="M{x} 26 L{} 36" stroke="{gill_colour}" stroke-width="1.6"/>"#, x - 1));
    }
    parts.push(r##"<circle cx="14" cy="28" r="1.8" fill="#1b2428"/>"##.to_owned());
    svg(&parts.concat())
}

fn body_form(state: &str) -> Option<String> {
    let path = match state {
        "sharkLike" => return Some(side_view(Side { highlight: Part::Tail, ..PLAIN_SHARK })),
        "flatShark" => "M60 6 Q74 8 72 18 L94 30 L70 32 L66 46 L62 58 L58 58 L54 46 L50 32 L26 30 L48 18 Q46 8 60 6Z",
        "rayLike" => "M60 4 L106 30 L60 46 L14 30 Z M58 46 L62 46 L61 59 L59 59 Z",
        "guitarfishLike" => "M60 3 Q76 16 75 28 L68 36 Q64 40 62 59 L58 59 Q56 40 52 36 L45 28 Q44 16 60 3 Z",
        "chimaeraLike" => {
            "M8 30 Q12 17 30 19 L70 26 Q90 30 119 32 Q90 34 70 36 L30 41 Q12 41 8 30 Z M34 20 L40 6 L48 21 Z"
        }
        _ => return None,
    };
    Some(svg(&format!(r#"<path d="{path}" fill="{MARK}"/>"#)))
}

fn swatch(fill: &str) -> String {
    svg(&format!(
        r##"<rect x="20" y="6" width="80" height="48" rx="8" fill="{fill}" stroke="#1b2428" stroke-width="0.8"/>"##
    ))
}

fn colour_swatch(state: &str) -> Option<String> {
    let fill = match state {
        "grey" => "#8a9196",
        "brown" => "#7a5a3a",
        "sandy" => "#c9ad7f",
        "blue" => "#4a78b5",
        "darkBlue" => "#23406e",
        "blackish" => "#2b2b2b",
        "silvery" => "#c8cfd4",
        "pale" => "#eeeae0",
        "greyish" => "#a0a4a8",
        "black" => "#202020",
        _ => return None,
    };
    Some(swatch(fill))
}

fn markings(state: &str) -> Option<String> {
    let base = format!(r#"<rect x="20" y="6" width="80" height="48" rx="8" fill="{BODY}"/>"#);
    let dots = |r: f64, fill: &str, step: usize| -> String {
        (0..)
            .map(|i| (28 + (i * step * 7) % 68, 12 + (i * step * 5) % 38))
            .take(48 / step)
            .map(|(x, y)| format!(r#"<circle cx="{x}" cy="{y}" r="{r}" fill="{fill}"/>"#))
            .collect()
    };
    let pattern = match state {
        "plain" => String::new(),
        "smallDarkSpots" => dots(1.4, "#1b2428", 1),
        "largeDarkSpots" => dots(4.0, "#1b2428", 4),
        "paleSpots" => dots(2.0, "#f4efe4", 2),
        "eyespots" => r##"<circle cx="45" cy="30" r="7" fill="#1b2428"/><circle cx="45" cy="30" r="4" fill="#e9c46a"/><circle cx="75" cy="30" r="7" fill="#1b2428"/><circle cx="75" cy="30" r="4" fill="#e9c46a"/>"##.to_owned(),
        "darkBands" => (0..5).map(|i| format!(r##"<rect x="{}" y="6" width="7" height="48" fill="#1b2428"/>"##, 26 + i * 15)).collect(),
        "paleLines" => (0..4).map(|i| format!(r##"<path d="M22 {y} Q40 {a} 60 {y} T98 {y}" stroke="#f4efe4" stroke-width="2" fill="none"/>"##, y = 14 + i * 11, a = 8 + i * 11)).collect(),
        "marbled" => r##"<path d="M25 15 Q40 5 50 20 T80 18 Q95 30 75 40 T40 45 Q22 38 25 15 Z" fill="#3f4a4e" opacity="0.8"/>"##.to_owned(),
        "whiteFinTip" => return Some(svg(&format!(r##"<path d="M30 54 L60 6 L90 54 Z" fill="{BODY}"/><path d="M52 19 L60 6 L68 19 Z" fill="#ffffff" stroke="#1b2428" stroke-width="0.6"/>"##))),
        _ => return None,
    };
    Some(svg(&(base + &pattern)))
}

fn ray_tail(spine: bool) -> String {
    let mut content = format!(
        r#"<path d="M60 2 L100 20 L60 30 L20 20 Z" fill="{BODY}"/><path d="M58 30 L62 30 L61 59 L59 59 Z" fill="{BODY}"/>"#
    );
    if spine {
        content.push_str(&format!(r#"<path d="M61 42 L70 36" stroke="{MARK}" stroke-width="2.5"/>"#));
    }
    svg(&content)
}

/// A head seen from above, or a ray's disc with its head.
fn head_from_above(state: &str) -> Option<String> {
    let head = match state {
        "pointed" => "M60 4 L84 40 L84 58 L36 58 L36 40 Z",
        "rounded" => "M36 58 L36 30 Q36 6 60 6 Q84 6 84 30 L84 58 Z",
        "flatWide" => "M14 30 Q14 14 60 14 Q106 14 106 30 L84 40 L84 58 L36 58 L36 40 Z",
        "inDisc" => "M60 6 L104 34 L60 56 L16 34 Z",
        "standsOut" => "M52 18 Q60 4 68 18 L104 38 L60 56 L16 38 Z",
        "hornFlaps" => "M44 6 L50 20 L70 20 L76 6 L80 22 L110 38 L60 56 L10 38 L40 22 Z",
        _ => return None,
    };
    Some(svg(&format!(
        r##"<path d="{head}" fill="{BODY}"/><path d="{head}" fill="none" stroke="{MARK}" stroke-width="2"/>"##
    )))
}

/// A shark's head from the side: snout length and where the mouth is.
fn head_from_side(snout_tip: u32, mouth_at_front: bool) -> String {
    let mouth = if mouth_at_front {
        format!(r#"<path d="M{snout_tip} 33 L{} 35" stroke="{MARK}" stroke-width="3"/>"#, snout_tip + 14)
    } else {
        format!(
            r#"<path d="M{} 40 Q{} 44 {} 40" stroke="{MARK}" stroke-width="3" fill="none"/>"#,
            snout_tip + 22,
            snout_tip + 30,
            snout_tip + 38
        )
    };
    svg(&format!(
        r##"<path d="M{snout_tip} 32 Q{} 22 {} 20 L118 16 L118 50 L{} 46 Q{} 42 {snout_tip} 32 Z" fill="{BODY}"/><circle cx="{}" cy="28" r="2.2" fill="#1b2428"/>{mouth}"##,
        snout_tip + 12,
        snout_tip + 34,
        snout_tip + 34,
        snout_tip + 12,
        snout_tip + 30,
    ))
}

/// The picture for one state of one character, if there is one.
pub fn picture(character: &str, state: &str) -> Option<String> {
    let with = |side: Side| Some(side_view(side));
    match (character, state) {
        ("bodyForm", s) => body_form(s),
        ("gillSlits", s) => {
            let gills = match s {
                "one" => 1,
                "five" => 5,
                "six" => 6,
                "seven" => 7,
                _ => return None,
            };
            with(Side { gills, highlight: Part::Gills, ..PLAIN_SHARK })
        }
        ("dorsalFins", "none") => with(Side { dorsal: Fin::None, second: Fin::None, ..PLAIN_SHARK }),
        ("dorsalFins", "one") => with(Side { second: Fin::None, ..PLAIN_SHARK }),
        ("dorsalFins", "two") => with(PLAIN_SHARK),
        ("secondDorsalSize", "nearlyAsLarge") => with(Side { second: Fin::Tall, ..PLAIN_SHARK }),
        ("secondDorsalSize", "muchSmaller") => with(PLAIN_SHARK),
        ("secondDorsalSize", "longLow") => with(Side { second: Fin::LongLow, ..PLAIN_SHARK }),
        ("secondDorsalSize", "noSecond") => with(Side { second: Fin::None, ..PLAIN_SHARK }),
        ("analFin", s) => with(Side { anal: s == "present", highlight: Part::Anal, ..PLAIN_SHARK }),
        ("dorsalSpines", s) => {
            let spines = match s {
                "both" => (true, true),
                "firstOnly" => (true, false),
                _ => (false, false),
            };
            with(Side { spines, anal: false, highlight: Part::Spines, ..PLAIN_SHARK })
        }
        ("caudalFinShape" | "caudalLobes", s) => {
            let tail = match s {
                "crescent" | "nearlyEqual" => Tail::Crescent,
                "asymmetric" | "upperLonger" => Tail::Asymmetric,
                "broadRounded" => Tail::Rounded,
                "filament" => Tail::Filament,
                "noTailFin" | "noLobes" => Tail::Missing,
                "upperAsLongAsBody" => Tail::Thresher,
                "lowerLonger" => Tail::LowerLonger,
                _ => return None,
            };
            with(Side { tail, highlight: Part::Tail, ..PLAIN_SHARK })
        }
        ("tailSpine", s) => Some(ray_tail(s == "present")),
        ("headShape", s) => head_from_above(s),
        ("snout", "long") => Some(head_from_side(2, false)),
        ("snout", "medium") => Some(head_from_side(14, false)),
        ("snout", "short") => Some(head_from_side(26, false)),
        ("mouthPosition", s) => Some(head_from_side(14, s == "atFront")),
        ("markings", s) => markings(s),
        ("colour" | "undersideColour", s) => colour_swatch(s),
        _ => None,
    }
}
