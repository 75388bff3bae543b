//! The Darwin Core terms wrackline writes, in column order, and the tables of an archive.
//!
//! Term names and IRIs are those of the TDWG Darwin Core term list
//! (`http://rs.tdwg.org/dwc/terms/<term>`). A [`Table`] is one file of a Darwin Core
//! Archive; the archive writer takes a core table and any extensions, so an Event core for
//! survey walks (with Occurrence as an extension) can be added beside today's Occurrence core.

/// The namespace of every Darwin Core term.
pub const DWC: &str = "http://rs.tdwg.org/dwc/terms/";

/// Occurrence terms, in column order; the first is the row's id.
pub const OCCURRENCE_TERMS: &[&str] = &[
    "occurrenceID",
    "basisOfRecord",
    "eventDate",
    "decimalLatitude",
    "decimalLongitude",
    "geodeticDatum",
    "coordinateUncertaintyInMeters",
    "kingdom",
    "scientificName",
    "taxonRank",
    "verbatimIdentification",
    "identifiedBy",
    "dateIdentified",
    "identificationRemarks",
    "identificationVerificationStatus",
    "individualCount",
    "sex",
    "lifeStage",
    "vitality",
    "occurrenceStatus",
    "recordedBy",
    "occurrenceRemarks",
    "associatedMedia",
    "organismID",
    "dataGeneralizations",
    "informationWithheld",
    "associatedOccurrences",
    "datasetName",
    "otherCatalogNumbers",
    "preparations",
    "disposition",
];

/// MeasurementOrFact terms with the occurrence they measure, for an event-core archive.
pub const EVENT_MEASUREMENT_TERMS: &[&str] = &[
    "occurrenceID",
    "measurementID",
    "measurementType",
    "measurementValue",
    "measurementUnit",
    "measurementMethod",
    "measurementRemarks",
    "measurementDeterminedDate",
];

/// MeasurementOrFact terms after the core id column, in an occurrence-core archive.
pub const MEASUREMENT_TERMS: &[&str] = after_occurrence_id(EVENT_MEASUREMENT_TERMS);

/// An event-core extension's terms without its leading `occurrenceID`: in an
/// occurrence-core archive the core id column already names the occurrence.
const fn after_occurrence_id(terms: &'static [&'static str]) -> &'static [&'static str] {
    match terms.split_first() {
        Some((_, rest)) => rest,
        None => terms,
    }
}

/// One data file of an archive.
#[derive(Debug, Clone, Copy)]
pub struct Table {
    /// The class IRI of its rows, e.g. `http://rs.tdwg.org/dwc/terms/Occurrence`.
    pub row_type: &'static str,
    /// The file name inside the zip.
    pub file: &'static str,
    /// Term names of the columns after the id (or core id) column.
    pub terms: &'static [&'static str],
}

/// Occurrences as the core: column 0 is `occurrenceID`, which is also the row id.
pub const OCCURRENCE_CORE: Table =
    Table { row_type: "http://rs.tdwg.org/dwc/terms/Occurrence", file: "occurrence.txt", terms: OCCURRENCE_TERMS };

/// Lengths: column 0 is the occurrence's id (the core id).
pub const MEASUREMENT_EXTENSION: Table = Table {
    row_type: "http://rs.tdwg.org/dwc/terms/MeasurementOrFact",
    file: "measurementorfact.txt",
    terms: MEASUREMENT_TERMS,
};

/// Survey walks (and incidental records) as the core, when an archive has walks.
pub const EVENT_CORE: Table =
    Table { row_type: "http://rs.tdwg.org/dwc/terms/Event", file: "event.txt", terms: super::events::EVENT_TERMS };

/// Occurrences as an extension of their event: column 0 is the event's id.
pub const OCCURRENCE_EXTENSION: Table =
    Table { row_type: "http://rs.tdwg.org/dwc/terms/Occurrence", file: "occurrence.txt", terms: OCCURRENCE_TERMS };

/// The identification history (TDWG Darwin Core Identification class; GBIF's
/// identification-history extension uses the same row type): one row per identification
/// of the organism, current and superseded. In an event-core archive the row first names
/// the occurrence it identifies.
pub const EVENT_IDENTIFICATION_TERMS: &[&str] = &[
    "occurrenceID",
    "identificationID",
    "scientificName",
    "taxonRank",
    "verbatimIdentification",
    "identifiedBy",
    "dateIdentified",
    "identificationRemarks",
    "identificationVerificationStatus",
];

/// Identification terms after the core id column, in an occurrence-core archive.
pub const IDENTIFICATION_TERMS: &[&str] = after_occurrence_id(EVENT_IDENTIFICATION_TERMS);

/// Identifications: column 0 is the occurrence's id (the core id).
pub const IDENTIFICATION_EXTENSION: Table = Table {
    row_type: "http://rs.tdwg.org/dwc/terms/Identification",
    file: "identification.txt",
    terms: IDENTIFICATION_TERMS,
};

/// Identifications in an event-core archive: column 0 is the event's id, `occurrenceID` names the animal.
pub const EVENT_IDENTIFICATION_EXTENSION: Table = Table {
    row_type: "http://rs.tdwg.org/dwc/terms/Identification",
    file: "identification.txt",
    terms: EVENT_IDENTIFICATION_TERMS,
};

/// Lengths in an event-core archive: column 0 is the event's id, `occurrenceID` names the animal.
pub const EVENT_MEASUREMENT_EXTENSION: Table = Table {
    row_type: "http://rs.tdwg.org/dwc/terms/MeasurementOrFact",
    file: "measurementorfact.txt",
    terms: EVENT_MEASUREMENT_TERMS,
};

/// Samples taken from an organism (TDWG Darwin Core ResourceRelationship class; GBIF's
/// Resource Relationship extension uses the same row type): one row per sample, the
/// sample's id as `resourceID`, "sample of" the occurrence named in `relatedResourceID`.
/// The same columns serve either core: each row names the occurrence itself.
pub const RELATIONSHIP_TERMS: &[&str] = &[
    "resourceRelationshipID",
    "resourceID",
    "relationshipOfResource",
    "relatedResourceID",
    "relationshipEstablishedDate",
    "relationshipRemarks",
];

/// Samples: column 0 is the core id (the occurrence's, or in an event-core archive its event's).
pub const RELATIONSHIP_EXTENSION: Table = Table {
    row_type: "http://rs.tdwg.org/dwc/terms/ResourceRelationship",
    file: "resourcerelationship.txt",
    terms: RELATIONSHIP_TERMS,
};
