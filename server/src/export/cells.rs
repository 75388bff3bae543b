//! Values made safe to open in a spreadsheet. A cell whose text starts with `=`, `+`,
//! `-` or `@` (or a tab or carriage return) is read by spreadsheet programs as a
//! formula, which can run commands or send data away ("CSV injection", OWASP). Such
//! text gets a `'` in front, the usual neutraliser (common practice, after OWASP's
//! guidance), so it shows as typed. Numbers are left alone: `-4.6` stays a number.
//!
//! Every format applies it to every value — CSV, the archive's tab-separated files and
//! GeoJSON properties — so a value reads the same whichever file it came from.

use std::borrow::Cow;

/// First characters that make a spreadsheet read a cell as a formula (OWASP, CSV injection).
const FORMULA_STARTS: [char; 6] = ['=', '+', '-', '@', '\t', '\r'];

/// `value`, with a `'` in front when a spreadsheet would take it for a formula.
pub fn spreadsheet_safe(value: &str) -> Cow<'_, str> {
    match value.chars().next() {
        Some(first) if FORMULA_STARTS.contains(&first) && !is_number(value) => Cow::Owned(format!("'{value}")),
        _ => Cow::Borrowed(value),
    }
}

/// A plain decimal number, such as `-4.654321` or `+3e2` (digits, one sign, a point, an exponent).
fn is_number(value: &str) -> bool {
    value.bytes().all(|b| b.is_ascii_digit() || matches!(b, b'+' | b'-' | b'.' | b'e' | b'E'))
        && value.parse::<f64>().is_ok_and(f64::is_finite)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn formulas_are_neutralised_and_numbers_are_not() {
        // OWASP "CSV Injection": cells starting with = + - @ tab or CR are formulas; prefix a quote.
        for (given, shown) in [
            ("=HYPERLINK(\"http://example.org\",\"x\")", "'=HYPERLINK(\"http://example.org\",\"x\")"),
            ("+44 7700 900123", "'+44 7700 900123"),
            ("-2+3+cmd|' /C calc'!A0", "'-2+3+cmd|' /C calc'!A0"),
            ("@SUM(A1:A2)", "'@SUM(A1:A2)"),
            ("\t=1+1", "'\t=1+1"),
            ("\r=1", "'\r=1"),
            ("-inf", "'-inf"),
            ("-4.654321", "-4.654321"),
            ("+3e2", "+3e2"),
            ("52.123456", "52.123456"),
            ("thornback ray", "thornback ray"),
            ("", ""),
            ("a = b", "a = b"),
        ] {
            assert_eq!(spreadsheet_safe(given), shown, "{given:?}");
        }
    }
}
