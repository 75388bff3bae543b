//! Reading a Darwin Core Archive's `meta.xml`: which file holds which rows, and which
//! column holds which term (TDWG Darwin Core Text Guide).
//!
//! Only what reading records needs is kept: each core or extension's `rowType`, file
//! location, delimiter, quote, header lines, the column of its `id` (core) or `coreid`
//! (extension), and its `field`s (0-based `index` and `term`, or a constant `default`).

use quick_xml::events::{BytesStart, Event};

/// A field's column, or the constant every row has.
#[derive(Debug, Clone, PartialEq)]
pub enum FieldSource {
    Index(usize),
    Constant(String),
}

/// One `core` or `extension` of the archive.
#[derive(Debug, Clone, PartialEq)]
pub struct ArchiveTable {
    /// `true` for the `core`, `false` for an `extension`.
    pub core: bool,
    /// The column holding the row's id (core) or its core row's id (extension).
    pub id_index: Option<usize>,
    pub row_type: String,
    pub location: String,
    pub delimiter: u8,
    pub quote: Option<u8>,
    pub header_lines: usize,
    /// (term IRI, source) pairs.
    pub fields: Vec<(String, FieldSource)>,
}

impl ArchiveTable {
    /// Where the term with this short name (`decimalLatitude`) or IRI comes from.
    pub fn source_of(&self, term: &str) -> Option<FieldSource> {
        self.fields
            .iter()
            .find(|(iri, _)| iri == term || iri.rsplit(['/', '#']).next() == Some(term))
            .map(|(_, source)| source.clone())
    }

    /// Short term names by column index, for error messages.
    pub fn column_names(&self) -> Vec<String> {
        let width = self.fields.iter().filter_map(|(_, s)| match s {
            FieldSource::Index(i) => Some(i + 1),
            FieldSource::Constant(_) => None,
        });
        let mut names = vec![String::new(); width.max().unwrap_or(0)];
        for (iri, source) in &self.fields {
            if let FieldSource::Index(i) = source {
                names[*i] = iri.rsplit(['/', '#']).next().unwrap_or(iri).to_owned();
            }
        }
        names
    }
}

/// Reads every core and extension described in `meta.xml`.
pub fn read_meta(xml: &str) -> Result<Vec<ArchiveTable>, String> {
    let mut reader = quick_xml::Reader::from_str(xml);
    let mut tables = Vec::new();
    let mut current: Option<ArchiveTable> = None;
    let mut in_location = false;
    loop {
        let position = reader.buffer_position();
        let event = reader.read_event().map_err(|err| format!("not well-formed XML near byte {position}: {err}"))?;
        match event {
            Event::Start(tag) | Event::Empty(tag) => match tag.local_name().as_ref() {
                name @ ("core" | "extension") => current = Some(table_start(&tag, name == "core")?),
                "location" => in_location = true,
                "id" | "coreid" => {
                    if let Some(table) = current.as_mut() {
                        let index = attribute(&tag, "index")?.ok_or("an <id> or <coreid> has no index")?;
                        table.id_index = Some(
                            index
                                .parse()
                                .map_err(|_| format!("{}: id index `{index}` is not a number", table.row_type))?,
                        );
                    }
                }
                "field" => {
                    if let Some(table) = current.as_mut() {
                        table.fields.push(field(&tag)?);
                    }
                }
                _ => {}
            },
            Event::Text(text) if in_location => {
                if let Some(table) = current.as_mut() {
                    let value = text.xml10_content();
                    table.location.push_str(value.trim());
                }
            }
            Event::End(tag) => match tag.local_name().as_ref() {
                "location" => in_location = false,
                "core" | "extension" => tables.extend(current.take()),
                _ => {}
            },
            Event::Eof => break,
            _ => {}
        }
    }
    if tables.is_empty() {
        return Err("no <core> or <extension> element".into());
    }
    Ok(tables)
}

fn attribute(tag: &BytesStart, name: &str) -> Result<Option<String>, String> {
    match tag.try_get_attribute(name).map_err(|err| err.to_string())? {
        Some(attr) => Ok(Some(
            attr.normalized_value(quick_xml::XmlVersion::Implicit1_0).map_err(|err| err.to_string())?.into_owned(),
        )),
        None => Ok(None),
    }
}

/// The text guide writes a tab as the two characters `\t`.
fn unescape(text: &str) -> String {
    text.replace("\\t", "\t").replace("\\n", "\n").replace("\\r", "\r")
}

fn table_start(tag: &BytesStart, core: bool) -> Result<ArchiveTable, String> {
    let row_type = attribute(tag, "rowType")?.ok_or("a core or extension has no rowType")?;
    let delimiter = unescape(&attribute(tag, "fieldsTerminatedBy")?.unwrap_or_else(|| ",".into()));
    let quote = unescape(&attribute(tag, "fieldsEnclosedBy")?.unwrap_or_else(|| "\"".into()));
    let encoding = attribute(tag, "encoding")?.unwrap_or_else(|| "UTF-8".into());
    if !encoding.eq_ignore_ascii_case("utf-8") {
        return Err(format!("{row_type}: only UTF-8 files can be read, not {encoding}"));
    }
    let single = |text: &str, what: &str| match text.as_bytes() {
        [b] => Ok(*b),
        _ => Err(format!("{row_type}: {what} `{text}` must be a single character")),
    };
    Ok(ArchiveTable {
        core,
        id_index: None,
        delimiter: single(&delimiter, "fieldsTerminatedBy")?,
        quote: if quote.is_empty() { None } else { Some(single(&quote, "fieldsEnclosedBy")?) },
        header_lines: attribute(tag, "ignoreHeaderLines")?
            .map(|n| n.parse().map_err(|_| format!("ignoreHeaderLines `{n}` is not a number")))
            .transpose()?
            .unwrap_or(0),
        location: String::new(),
        fields: Vec::new(),
        row_type,
    })
}

fn field(tag: &BytesStart) -> Result<(String, FieldSource), String> {
    let term = attribute(tag, "term")?.ok_or("a <field> has no term")?;
    let source = match (attribute(tag, "index")?, attribute(tag, "default")?) {
        (Some(index), _) => {
            FieldSource::Index(index.parse().map_err(|_| format!("field {term}: index `{index}` is not a number"))?)
        }
        (None, Some(default)) => FieldSource::Constant(default),
        (None, None) => return Err(format!("field {term} has neither an index nor a default")),
    };
    Ok((term, source))
}
