//! A few words for writing JSON Schemas with utoipa's builders: the spec's vocabulary, so
//! that each operation reads as a short table of its fields.

use crate::calc::quantity::{self, Dimension};
use serde_json::Value;
use utoipa::openapi::RefOr;
use utoipa::openapi::schema::{
    AdditionalProperties, ArrayBuilder, ObjectBuilder, OneOfBuilder, Ref, Schema, SchemaType, Type,
};

/// A schema or a reference to a named one.
pub type S = RefOr<Schema>;

fn typed(t: Type) -> ObjectBuilder {
    ObjectBuilder::new().schema_type(t)
}

pub fn string() -> S {
    typed(Type::String).into()
}

/// A string of at most `max` characters.
pub fn text(max: usize) -> S {
    typed(Type::String).max_length(Some(max)).into()
}

/// A string that must not be empty (after trimming), of at most `max` characters.
pub fn required_text(max: usize) -> S {
    typed(Type::String)
        .min_length(Some(1))
        .max_length(Some(max))
        .pattern(Some(r"\S"))
        .into()
}

pub fn integer() -> S {
    typed(Type::Integer).into()
}

/// A whole number in `min..=max`.
pub fn int_range(min: i64, max: i64) -> S {
    typed(Type::Integer)
        .minimum(Some(min))
        .maximum(Some(max))
        .into()
}

/// An id of a stored record (a positive whole number that fits in 64 bits).
pub fn id() -> S {
    typed(Type::Integer)
        .minimum(Some(1i64))
        .maximum(Some(i64::MAX))
        .into()
}

/// A query parameter's value: `schema`, or blank (an empty value counts as absent).
pub fn or_blank(schema: S) -> S {
    utoipa::openapi::schema::AnyOfBuilder::new()
        .item(schema)
        .item(typed(Type::String).pattern(Some(r"^[\s\u0085]*$")))
        .into()
}

pub fn number() -> S {
    typed(Type::Number).into()
}

/// A number of at least `min`, at most `max`.
pub fn number_range(min: f64, max: f64) -> S {
    typed(Type::Number)
        .minimum(Some(min))
        .maximum(Some(max))
        .into()
}

pub fn boolean() -> S {
    typed(Type::Boolean).into()
}

/// One of a fixed set of words.
pub fn words(options: &[&str]) -> S {
    typed(Type::String)
        .enum_values(Some(options.iter().copied()))
        .into()
}

/// A calendar date `YYYY-MM-DD`.
pub fn date() -> S {
    typed(Type::String)
        .pattern(Some(
            r"^\s*[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])\s*$",
        ))
        .into()
}

/// A reference to `#/components/schemas/{name}`.
pub fn reference(name: &str) -> S {
    RefOr::Ref(Ref::from_schema_name(name))
}

/// Any JSON value.
pub fn any() -> S {
    ObjectBuilder::new()
        .schema_type(SchemaType::AnyValue)
        .into()
}

/// `schema` or `null`.
pub fn nullable(schema: S) -> S {
    match schema {
        RefOr::T(Schema::Object(mut object)) => {
            if let SchemaType::Type(t) = object.schema_type {
                object.schema_type = SchemaType::from_iter([t, Type::Null]);
            }
            if let Some(values) = object.enum_values.as_mut() {
                values.push(Value::Null);
            }
            RefOr::T(Schema::Object(object))
        }
        other => OneOfBuilder::new()
            .item(other)
            .item(typed(Type::Null))
            .into(),
    }
}

/// A list of `items`.
pub fn array(items: S) -> S {
    RefOr::T(Schema::Array(ArrayBuilder::new().items(items).build()))
}

/// A list of at most `max` `items`.
pub fn array_max(items: S, max: usize) -> S {
    RefOr::T(Schema::Array(
        ArrayBuilder::new()
            .items(items)
            .max_items(Some(max))
            .build(),
    ))
}

fn with_props(
    mut builder: ObjectBuilder,
    props: Vec<(&str, S)>,
    required: &[&str],
) -> ObjectBuilder {
    for (name, schema) in props {
        builder = builder.property(name, schema);
    }
    for name in required {
        builder = builder.required(*name);
    }
    builder
}

/// An answer's object: these properties (others may be added later without breaking it).
pub fn object(props: Vec<(&str, S)>, required: &[&str]) -> S {
    with_props(typed(Type::Object), props, required).into()
}

/// A request's object: exactly these properties; the server refuses any other (`unknown_field`).
pub fn closed(props: Vec<(&str, S)>, required: &[&str]) -> S {
    with_props(typed(Type::Object), props, required)
        .additional_properties(Some(AdditionalProperties::FreeForm(false)))
        .into()
}

/// The number part of a quantity string: optional sign, digits, optional decimals and
/// exponent (as the parser in `calc::quantity::parse_str` reads it).
fn number_pattern(signed: bool) -> &'static str {
    if signed {
        r"[-+]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]{1,3})?"
    } else {
        r"\+?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]{1,3})?"
    }
}

fn escape(symbol: &str) -> String {
    symbol
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() || c == '/' {
                c.to_string()
            } else {
                format!("\\{c}")
            }
        })
        .collect()
}

/// A quantity in a request: `"<number> <unit>"` or `{"value": n, "unit": "u"}`, with the units
/// the parser accepts for `dimension` (taken from its own table). A bare number is refused.
pub fn quantity_in(dimension: Dimension, signed: bool) -> S {
    let units = quantity::accepted_units(dimension);
    let alternatives: Vec<String> = units.iter().map(|u| escape(u)).collect();
    let pattern = format!(
        r"^\s*{}\s*(?:{})\s*$",
        number_pattern(signed),
        alternatives.join("|")
    );
    let description = format!(
        "a {} with its unit, e.g. {} (units: {})",
        dimension.name(),
        quantity::example(dimension),
        units.join(", ")
    );
    let as_text = typed(Type::String).pattern(Some(pattern));
    let mut value = typed(Type::Number);
    if !signed && dimension != Dimension::Temperature {
        value = value.minimum(Some(0.0));
    }
    let as_object = with_props(
        typed(Type::Object),
        vec![("value", value.into()), ("unit", words(&units))],
        &["value", "unit"],
    )
    .additional_properties(Some(AdditionalProperties::FreeForm(false)));
    OneOfBuilder::new()
        .item(as_text)
        .item(as_object)
        .description(Some(description))
        .into()
}

/// An optional quantity in a request (`null` counts as absent).
pub fn opt_quantity_in(dimension: Dimension) -> S {
    nullable(quantity_in(dimension, false))
}

/// A quantity in an answer: `{"si", "value", "unit"}`.
pub fn quantity() -> S {
    reference("Quantity")
}

/// A quantity in an answer, or `null` when absent.
pub fn opt_quantity() -> S {
    nullable(quantity())
}

/// A page of a list: `{"items": [...], "next_cursor": "<id>" | null}`.
pub fn page(item: S) -> S {
    object(
        vec![("items", array(item)), ("next_cursor", nullable(string()))],
        &["items", "next_cursor"],
    )
}

/// The properties named in `names`, each looked up with `lookup`.
pub fn pick(names: &[&'static str], lookup: fn(&str) -> S) -> Vec<(&'static str, S)> {
    names.iter().map(|name| (*name, lookup(name))).collect()
}
