//! The catalogues against the code: every message id the code uses is in every
//! language's catalogue, no catalogue has an id the code does not use, each message has
//! the same placeholders in every language, and no screen file holds words of its own
//! outside the catalogues. The code is read as text with a small Rust tokenizer (string
//! literals, comments and identifiers), which is enough for these checks.

use std::collections::{BTreeMap, BTreeSet};
use std::path::{Path, PathBuf};

use fluent_syntax::ast;

use super::*;

/// One language's catalogue: message id → the names of its placeholders.
type Placeholders = BTreeMap<String, BTreeSet<String>>;

fn app_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// Parses `source`, failing on any syntax error, and lists its messages' placeholders.
fn placeholders(code: &str, source: &str) -> Placeholders {
    let resource = fluent_syntax::parser::parse(source.to_owned())
        .unwrap_or_else(|(_, errors)| panic!("{code}: the catalogue does not parse: {errors:?}"));
    let mut messages = Placeholders::new();
    for entry in resource.body {
        match entry {
            ast::Entry::Message(message) => {
                let id = message.id.name.clone();
                let mut names = BTreeSet::new();
                if let Some(pattern) = &message.value {
                    pattern_variables(pattern, &mut names);
                }
                assert!(!message.attributes.is_empty() || message.value.is_some(), "{code}: {id} is empty");
                assert!(messages.insert(id.clone(), names).is_none(), "{code}: {id} appears twice");
            }
            ast::Entry::Junk { content } => panic!("{code}: unreadable entry: {content}"),
            _ => {}
        }
    }
    messages
}

fn pattern_variables(pattern: &ast::Pattern<String>, names: &mut BTreeSet<String>) {
    for element in &pattern.elements {
        if let ast::PatternElement::Placeable { expression } = element {
            expression_variables(expression, names);
        }
    }
}

fn expression_variables(expression: &ast::Expression<String>, names: &mut BTreeSet<String>) {
    match expression {
        ast::Expression::Select { selector, variants } => {
            inline_variables(selector, names);
            for variant in variants {
                pattern_variables(&variant.value, names);
            }
        }
        ast::Expression::Inline(inline) => inline_variables(inline, names),
    }
}

fn inline_variables(inline: &ast::InlineExpression<String>, names: &mut BTreeSet<String>) {
    match inline {
        ast::InlineExpression::VariableReference { id } => {
            names.insert(id.name.clone());
        }
        ast::InlineExpression::Placeable { expression } => expression_variables(expression, names),
        ast::InlineExpression::FunctionReference { arguments, .. } => {
            for argument in &arguments.positional {
                inline_variables(argument, names);
            }
        }
        _ => {}
    }
}

/// A piece of Rust source as far as these checks need: string literals (their text),
/// identifiers, and single punctuation characters; comments are dropped.
#[derive(Debug, Clone, PartialEq)]
enum Token {
    Str(String),
    Ident(String),
    Punct(char),
}

/// Splits Rust source into [`Token`]s: enough of Rust's lexical rules for the app's code
/// (plain, raw and byte strings, char literals and lifetimes, line and block comments).
fn tokenize(source: &str) -> Vec<Token> {
    let chars: Vec<char> = source.chars().collect();
    let mut tokens = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        let c = chars[i];
        let next = chars.get(i + 1).copied();
        if c == '/' && next == Some('/') {
            while i < chars.len() && chars[i] != '\n' {
                i += 1;
            }
        } else if c == '/' && next == Some('*') {
            let mut depth = 0;
            while i < chars.len() {
                if chars[i] == '/' && chars.get(i + 1) == Some(&'*') {
                    depth += 1;
                    i += 2;
                } else if chars[i] == '*' && chars.get(i + 1) == Some(&'/') {
                    depth -= 1;
                    i += 2;
                    if depth == 0 {
                        break;
                    }
                } else {
                    i += 1;
                }
            }
        } else if c == '"' {
            let (text, end) = plain_string(&chars, i + 1);
            tokens.push(Token::Str(text));
            i = end;
        } else if (c == 'r' || c == 'b') && raw_string_start(&chars, i).is_some() {
            let (hashes, open) = raw_string_start(&chars, i).unwrap_or_default();
            let closing: Vec<char> = std::iter::once('"').chain(std::iter::repeat_n('#', hashes)).collect();
            let mut end = open;
            while end < chars.len() && !chars[end..].starts_with(&closing) {
                end += 1;
            }
            tokens.push(Token::Str(chars[open..end].iter().collect()));
            i = end + closing.len();
        } else if c == '\'' {
            // A char literal ('x', '\n', '\'') or a lifetime ('a): skip either.
            if next == Some('\\') {
                i += 2;
                while i < chars.len() && chars[i] != '\'' {
                    i += 1;
                }
                i += 1;
            } else if chars.get(i + 2) == Some(&'\'') {
                i += 3;
            } else {
                i += 1;
            }
        } else if c.is_alphanumeric() || c == '_' {
            let start = i;
            while i < chars.len() && (chars[i].is_alphanumeric() || chars[i] == '_') {
                i += 1;
            }
            tokens.push(Token::Ident(chars[start..i].iter().collect()));
        } else {
            if !c.is_whitespace() {
                tokens.push(Token::Punct(c));
            }
            i += 1;
        }
    }
    tokens
}

/// The text of a `"…"` literal whose body starts at `start`, and where it ends.
fn plain_string(chars: &[char], start: usize) -> (String, usize) {
    let mut text = String::new();
    let mut i = start;
    while i < chars.len() && chars[i] != '"' {
        if chars[i] == '\\' {
            i += 1;
        }
        if let Some(&c) = chars.get(i) {
            text.push(c);
        }
        i += 1;
    }
    (text, i + 1)
}

/// When `r"`, `r#"`, `br"`… starts at `at` (and is not the end of an identifier): the
/// number of `#`s and where the body starts.
fn raw_string_start(chars: &[char], at: usize) -> Option<(usize, usize)> {
    if at > 0 && (chars[at - 1].is_alphanumeric() || chars[at - 1] == '_') {
        return None;
    }
    let mut i = at;
    if chars[i] == 'b' {
        i += 1;
        if chars.get(i) == Some(&'"') {
            return Some((0, i + 1));
        }
    }
    if chars.get(i) != Some(&'r') {
        return None;
    }
    i += 1;
    let hashes = chars[i..].iter().take_while(|c| **c == '#').count();
    (chars.get(i + hashes) == Some(&'"')).then_some((hashes, i + hashes + 1))
}

fn rust_files(dir: &Path, files: &mut Vec<PathBuf>) {
    for entry in std::fs::read_dir(dir).expect("the app's source folder is readable") {
        let path = entry.expect("a readable folder entry").path();
        if path.is_dir() {
            rust_files(&path, files);
        } else if path.extension().is_some_and(|e| e == "rs") {
            files.push(path);
        }
    }
}

/// The app's source files, without this test (which names ids of its own).
fn source_files() -> Vec<(PathBuf, Vec<Token>)> {
    let mut files = Vec::new();
    rust_files(&app_dir().join("src"), &mut files);
    files.sort();
    files
        .into_iter()
        .filter(|path| !path.ends_with("data/words/tests.rs"))
        .map(|path| {
            let source = std::fs::read_to_string(&path).expect("a readable source file");
            (path, tokenize(&source))
        })
        .collect()
}

/// The message ids the code asks for: the literal first argument of every `t(…)` and
/// `t_args(…)` call. A call whose id is not a literal is an error, since no test could
/// then say whether its message exists.
fn ids_used(files: &[(PathBuf, Vec<Token>)]) -> BTreeMap<String, PathBuf> {
    let mut used = BTreeMap::new();
    for (path, tokens) in files {
        for (i, token) in tokens.iter().enumerate() {
            let Token::Ident(name) = token else { continue };
            let is_call = (name == "t" || name == "t_args") && tokens.get(i + 1) == Some(&Token::Punct('('));
            let is_definition = i > 0 && tokens[i - 1] == Token::Ident("fn".to_owned());
            if !is_call || is_definition {
                continue;
            }
            match tokens.get(i + 2) {
                Some(Token::Str(id)) => {
                    used.entry(id.clone()).or_insert_with(|| path.clone());
                }
                other => panic!("{}: {name}(…) with an id that is not a literal: {other:?}", path.display()),
            }
        }
    }
    used
}

/// Each language's catalogue: `app.ftl`, the desk's `desk.ftl` and the phone's
/// `phone.ftl` together (an id may be in only one of them).
fn catalogues() -> Vec<(&'static str, Placeholders)> {
    LANGUAGES
        .iter()
        .map(|(code, _, source)| {
            let mut messages = placeholders(code, source);
            for (file, own) in [
                ("desk.ftl", bundle_words(&DESK_CATALOGUES, code)),
                ("phone.ftl", bundle_words(&PHONE_CATALOGUES, code)),
            ] {
                for (id, names) in own {
                    assert!(messages.insert(id.clone(), names).is_none(), "{code}: {id} is in {file} and another file");
                }
            }
            (*code, messages)
        })
        .collect()
}

/// One bundle's own messages in `code`.
fn bundle_words(catalogues: &[(&str, &str)], code: &str) -> Placeholders {
    let (_, source) = catalogues.iter().find(|(c, _)| *c == code).expect("every language has each bundle's words");
    placeholders(code, source)
}

/// Which bundle compiles a source file: a screen module `screens/mod.rs` marks
/// `#[cfg(feature = "desk")]` is the desk's, one it marks `#[cfg(not(feature = "desk"))]`
/// the phone's; everything else is in both.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Bundle {
    Phone,
    Desk,
    Both,
}

fn bundles_of_screens() -> BTreeMap<String, Bundle> {
    let source = std::fs::read_to_string(app_dir().join("src/screens/mod.rs")).expect("screens/mod.rs is readable");
    let mut marked = BTreeMap::new();
    let mut pending = None;
    for line in source.lines().map(str::trim) {
        if line == r#"#[cfg(feature = "desk")]"# {
            pending = Some(Bundle::Desk);
        } else if line == r#"#[cfg(not(feature = "desk"))]"# {
            pending = Some(Bundle::Phone);
        } else if let Some(name) = line.strip_prefix("pub mod ").or_else(|| line.strip_prefix("mod ")) {
            marked.insert(name.trim_end_matches(';').to_owned(), pending.take().unwrap_or(Bundle::Both));
        }
    }
    marked
}

fn bundle_of(path: &Path, screens: &BTreeMap<String, Bundle>) -> Bundle {
    let Ok(inside) = path.strip_prefix(app_dir().join("src/screens")) else { return Bundle::Both };
    let first = inside.components().next().map(|c| c.as_os_str().to_string_lossy().trim_end_matches(".rs").to_owned());
    first.and_then(|name| screens.get(&name).copied()).unwrap_or(Bundle::Both)
}

/// Each bundle carries only its own words: the phone's screens ask for none of the
/// desk's, the desk's screens for none of the phone's, and code in both bundles for none
/// of the phone's (the desk's words asked for by code in both bundles are for functions
/// only the desk calls; the phone would show their ids).
#[test]
fn each_bundle_finds_the_words_it_asks_for_in_its_own_catalogues() {
    let screens = bundles_of_screens();
    assert_eq!(screens.get("review"), Some(&Bundle::Desk), "screens/mod.rs was not read: {screens:?}");
    assert_eq!(screens.get("record"), Some(&Bundle::Phone), "screens/mod.rs was not read: {screens:?}");
    for (code, _, _) in LANGUAGES {
        let desk = bundle_words(&DESK_CATALOGUES, code);
        let phone = bundle_words(&PHONE_CATALOGUES, code);
        for (path, tokens) in source_files() {
            let file = vec![(path.clone(), tokens)];
            for id in ids_used(&file).keys() {
                let wrong = match bundle_of(&path, &screens) {
                    Bundle::Phone => desk.contains_key(id).then_some("desk.ftl"),
                    Bundle::Desk | Bundle::Both => phone.contains_key(id).then_some("phone.ftl"),
                };
                assert!(wrong.is_none(), "{code}: {} asks for {id}, which is in {wrong:?} only", path.display());
            }
        }
    }
}

#[test]
fn every_id_the_code_uses_is_in_every_catalogue_and_no_catalogue_has_others() {
    let used = ids_used(&source_files());
    assert!(used.len() > 50, "the scan found only {} ids: is it reading the code?", used.len());
    for (code, messages) in catalogues() {
        let missing: Vec<String> = used
            .iter()
            .filter(|(id, _)| !messages.contains_key(*id))
            .map(|(id, p)| format!("{id} ({})", p.display()))
            .collect();
        assert!(missing.is_empty(), "{code}: missing from the catalogue: {missing:#?}");
        let unused: Vec<&String> = messages.keys().filter(|id| !used.contains_key(*id)).collect();
        assert!(unused.is_empty(), "{code}: in the catalogue but used by no code: {unused:#?}");
    }
}

#[test]
fn each_message_has_the_same_placeholders_in_every_language() {
    let catalogues = catalogues();
    let (first_code, first) = &catalogues[0];
    for (code, messages) in &catalogues[1..] {
        for (id, names) in first {
            let Some(theirs) = messages.get(id) else { panic!("{code}: {id} is missing") };
            assert_eq!(names, theirs, "{id}: placeholders in {first_code} and {code} differ");
        }
    }
}

/// Attributes whose values are never shown to people as words (`field` is the end of
/// `data-field`, the field a problem is about as the server names it).
const TECHNICAL_ATTRIBUTES: [&str; 26] = [
    "class",
    "id",
    "type",
    "href",
    "name",
    "for",
    "role",
    "accept",
    "capture",
    "inputmode",
    "autocomplete",
    "step",
    "min",
    "max",
    "pattern",
    "rel",
    "target",
    "download",
    "value",
    "src",
    "lang",
    "style",
    "field",
    "scope",
    "draggable",
    "list",
];

/// Literals in screen files that are not words for people: CSS classes chosen in code,
/// the screens' `#…` addresses, element ids, values of form controls and routes.
const TECHNICAL_LITERALS: [&str; 24] = [
    "#urgent",
    "#samples",
    "#people",
    "#review",
    "#figures",
    "wrackline",
    "#safety",
    "pill online",
    "pill offline",
    "my-record",
    "my-record asked",
    "#6b7b80",
    "#e07a1f",
    "record-form",
    "tel:{number}",
    "range-figures",
    "range-map",
    "trend-section",
    "trend-chart",
    "translate({x:.0}px, {y:.0}px) scale({:.3})",
    "exif-file",
    "exif-phone",
    "exif-none",
    "device",
];

/// Screen files that only draw: SVG markup, paths and colours keyed by the checklist's
/// character and state codes, `aria-hidden`, with no words for people (a state's words
/// come from the checklist and are shown beside its picture).
const DRAWINGS: [&str; 1] = ["record/pictures.rs"];

/// Every literal with letters in a screen file that is not a message id, a placeholder's
/// name, a technical attribute's value or a listed technical literal: words that would
/// be shown in one language only. Words built in `data/` modules have their own scan
/// ([`words_left_in_data`]); words that arrive from the server (its error messages stay
/// in English by design) are seen by neither.
fn words_left_in_screens(files: &[(PathBuf, Vec<Token>)]) -> Vec<String> {
    let mut found = Vec::new();
    let is_screen = |path: &PathBuf| path.components().any(|c| c.as_os_str() == "screens");
    let is_drawing = |path: &PathBuf| DRAWINGS.iter().any(|file| path.ends_with(format!("screens/{file}")));
    for (path, tokens) in files.iter().filter(|(path, _)| is_screen(path) && !is_drawing(path)) {
        let mut i = 0;
        while i < tokens.len() {
            // Attributes (`#[cfg(feature = "desk")]`) are code, not words.
            if tokens[i] == Token::Punct('#') && tokens.get(i + 1) == Some(&Token::Punct('[')) {
                i = closing(tokens, i + 1, '[', ']');
                continue;
            }
            // Message ids, and the field names (as the server names them) a form problem
            // is shown beside.
            if let Token::Ident(name) = &tokens[i]
                && (name == "t" || name == "t_args" || name == "field_note")
                && tokens.get(i + 1) == Some(&Token::Punct('('))
            {
                i = closing(tokens, i + 1, '(', ')');
                continue;
            }
            if let Token::Str(text) = &tokens[i]
                && has_words(text)
                && !after_technical_attribute(tokens, i)
                && !is_index_key(tokens, i)
                && !TECHNICAL_LITERALS.contains(&text.as_str())
            {
                found.push(format!("{}: {text:?}", path.display()));
            }
            i += 1;
        }
    }
    found
}

/// Whether `text` has letters outside `{…}` placeholders.
fn has_words(text: &str) -> bool {
    let mut depth = 0;
    text.chars().any(|c| {
        match c {
            '{' => depth += 1,
            '}' => depth -= 1,
            _ => {}
        }
        depth == 0 && c.is_alphabetic()
    })
}

/// Whether the literal at `i` is the value of a technical attribute (`class="…"`).
fn after_technical_attribute(tokens: &[Token], i: usize) -> bool {
    if i < 2 || tokens[i - 1] != Token::Punct('=') {
        return false;
    }
    matches!(&tokens[i - 2], Token::Ident(name) if TECHNICAL_ATTRIBUTES.contains(&name.as_str()))
}

/// Whether the literal at `i` is a key indexing a value (`report["taxa"]`), not words.
fn is_index_key(tokens: &[Token], i: usize) -> bool {
    i >= 2
        && tokens[i - 1] == Token::Punct('[')
        && tokens.get(i + 1) == Some(&Token::Punct(']'))
        && matches!(&tokens[i - 2], Token::Ident(_) | Token::Punct(']' | ')'))
}

/// The index just after the `close` matching the `open_char` at `open`.
fn closing(tokens: &[Token], open: usize, open_char: char, close: char) -> usize {
    let mut depth = 0;
    for (i, token) in tokens.iter().enumerate().skip(open) {
        match token {
            Token::Punct(c) if *c == open_char => depth += 1,
            Token::Punct(c) if *c == close => {
                depth -= 1;
                if depth == 0 {
                    return i + 1;
                }
            }
            _ => {}
        }
    }
    tokens.len()
}

/// Calls whose literal arguments are for engineers, not people: messages of a failed
/// invariant, and log lines.
const ENGINEERS_CALLS: [&str; 6] = ["expect", "panic", "unreachable", "assert", "debug_assert", "log"];

/// Literals in `data/` modules that read like words but are not the app's words: codes
/// and headers the server sends or expects, CSS classes, the names the languages give
/// themselves (shown as they are in every language), a taxon name, and the server's own
/// English sentences that the figures screen recognises in order to leave them out.
const TECHNICAL_DATA_LITERALS: [&str; 14] = [
    "Bearer {token}",
    "state draft",
    "state waiting",
    "state received",
    "state refused",
    "English",
    "Cymraeg",
    "Scyliorhinus canicula",
    "QuasiPoisson",
    "NegativeBinomial",
    "not a listing decision",
    "Stranding and landing records show",
    "observer guess",
    "observer with the guided key",
];

/// Every literal in a `data/` module's own code (its tests left out) that reads as words
/// for people — two or more words, or one capitalised word — and is not a message id, an
/// engineers' message or a listed code. Single lower-case words are taken for codes
/// (`"confirmed"`, `"dwca"`), so a word like that built here is not seen.
fn words_left_in_data(files: &[(PathBuf, Vec<Token>)]) -> Vec<String> {
    let mut found = Vec::new();
    let in_data = |path: &PathBuf| path.strip_prefix(app_dir().join("src/data")).is_ok();
    let is_test_file = |path: &PathBuf| path.file_name().is_some_and(|name| name == "tests.rs");
    for (path, tokens) in files.iter().filter(|(path, _)| in_data(path) && !is_test_file(path)) {
        let mut i = 0;
        while i < tokens.len() {
            if tokens[i] == Token::Punct('#') && tokens.get(i + 1) == Some(&Token::Punct('[')) {
                i = after_attribute(tokens, i);
                continue;
            }
            if let Token::Ident(name) = &tokens[i]
                && (name == "t" || name == "t_args" || ENGINEERS_CALLS.contains(&name.as_str()))
                && matches!(tokens.get(i + 1), Some(Token::Punct('(' | '!')))
            {
                let open = if tokens.get(i + 1) == Some(&Token::Punct('!')) { i + 2 } else { i + 1 };
                i = closing(tokens, open, '(', ')');
                continue;
            }
            if let Token::Str(text) = &tokens[i]
                && reads_as_words(text)
                && !is_index_key(tokens, i)
                && !TECHNICAL_DATA_LITERALS.contains(&text.as_str())
            {
                found.push(format!("{}: {text:?}", path.display()));
            }
            i += 1;
        }
    }
    found
}

/// The index after the attribute starting at `i` (`#[…]`), and after the whole item
/// when the attribute is `#[cfg(test)]` (a test module's literals are not shown to anyone).
fn after_attribute(tokens: &[Token], i: usize) -> usize {
    let end = closing(tokens, i + 1, '[', ']');
    let is_cfg_test = tokens[i + 2..end]
        == [
            Token::Ident("cfg".to_owned()),
            Token::Punct('('),
            Token::Ident("test".to_owned()),
            Token::Punct(')'),
            Token::Punct(']'),
        ];
    if !is_cfg_test {
        return end;
    }
    // The item: up to its `;` (`mod tests;`) or through its `{…}` body.
    let mut j = end;
    while j < tokens.len() {
        match tokens[j] {
            Token::Punct(';') => return j + 1,
            Token::Punct('{') => return closing(tokens, j, '{', '}'),
            _ => j += 1,
        }
    }
    j
}

/// Whether `text`, outside `{…}` placeholders, has two or more words with letters, or
/// starts with a capital followed by a small letter. Pieces with `/`, `%` or `=` (paths,
/// queries, date formats) are not words.
fn reads_as_words(text: &str) -> bool {
    let mut outside = String::new();
    let mut depth = 0;
    for c in text.chars() {
        match c {
            '{' => depth += 1,
            '}' => depth -= 1,
            _ if depth == 0 => outside.push(c),
            _ => outside.push(' '),
        }
    }
    let is_word = |piece: &&str| piece.chars().any(char::is_alphabetic) && !piece.contains(['/', '%', '=']);
    let words = outside.split_whitespace().filter(is_word).count();
    let mut letters = outside.trim_start().chars();
    let capitalised =
        matches!((letters.next(), letters.next()), (Some(a), Some(b)) if a.is_uppercase() && b.is_lowercase());
    words >= 2 || capitalised
}

#[test]
fn no_data_module_builds_words_of_its_own() {
    let left = words_left_in_data(&source_files());
    assert!(left.is_empty(), "words built in data/ that are not in the catalogues ({}): {left:#?}", left.len());
}

#[test]
fn the_data_scan_sees_words_and_not_codes() {
    let tokens = tokenize(
        r#"fn a() -> String { format!("{n} records kept") } const C: &str = "confirmed";
        const P: &str = "/api/x/{id}"; const F: &str = "%Y-%m-%d %H:%M"; fn b() { x.expect("a broken invariant"); }
        fn c() -> &'static str { "Notes" }
        #[cfg(test)] mod tests { const T: &str = "test words here"; }"#,
    );
    let files = vec![(app_dir().join("src/data/x.rs"), tokens)];
    let found: Vec<String> = words_left_in_data(&files)
        .into_iter()
        .map(|line| line.rsplit(": ").next().unwrap_or_default().to_owned())
        .collect();
    assert_eq!(found, ["\"{n} records kept\"", "\"Notes\""]);
}

#[test]
fn no_screen_keeps_words_of_its_own() {
    let left = words_left_in_screens(&source_files());
    assert!(left.is_empty(), "words in screen files that are not in the catalogues ({}): {left:#?}", left.len());
    for file in DRAWINGS {
        assert!(app_dir().join("src/screens").join(file).is_file(), "{file} is listed in DRAWINGS but is not there");
    }
}

#[test]
fn the_scans_see_what_they_look_for() {
    let tokens = tokenize(
        r#"let a = t("one-id"); view! { <p class="x">"Hello"</p> } // t("in-a-comment")
        let k = report["key"]; let l = ["Listed"]; field_note(p, "a_field");"#,
    );
    let files = vec![(PathBuf::from("src/screens/x.rs"), tokens)];
    assert_eq!(ids_used(&files).keys().collect::<Vec<_>>(), ["one-id"]);
    assert_eq!(words_left_in_screens(&files), ["src/screens/x.rs: \"Hello\"", "src/screens/x.rs: \"Listed\""]);
    let raw = tokenize(r###"r#"a "quoted" b"# 'c' 'life x"###);
    assert_eq!(raw[0], Token::Str("a \"quoted\" b".to_owned()));
}

#[test]
fn the_language_is_the_first_one_the_app_speaks() {
    let tags = |list: &[&str]| list.iter().map(|s| s.to_string()).collect::<Vec<_>>();
    assert_eq!(pick_language(tags(&["cy-GB", "en-GB"])), "cy");
    assert_eq!(pick_language(tags(&["fr-FR", "en-US"])), "en");
    assert_eq!(pick_language(tags(&["de"])), "en");
    assert_eq!(pick_language(tags(&[])), "en");
    assert_eq!(pick_language(tags(&["CY"])), "cy");
}
