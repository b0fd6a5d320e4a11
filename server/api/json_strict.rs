//! Reading JSON with every object key at most once. serde_json keeps the last of repeated
//! keys, so `{"result": "fail", "result": "pass"}` would be stored as a pass; a safety record
//! must not depend on which copy a reader keeps, so a repeated key refuses the whole body.

use serde::de::{self, Deserialize, Deserializer, MapAccess, SeqAccess, Visitor};
use serde_json::{Map, Number, Value};
use std::fmt;

/// Why a body could not be read.
#[derive(Debug)]
pub enum StrictError {
    /// The key that appears twice in one object.
    Duplicate(String),
    /// Not JSON at all (serde_json's message, with line and column).
    Syntax(String),
}

const MARK: &str = "duplicate key: ";

/// Parses `bytes` as JSON, refusing an object that repeats a key.
pub fn parse(bytes: &[u8]) -> Result<Value, StrictError> {
    let mut reader = serde_json::Deserializer::from_slice(bytes);
    let value = Strict::deserialize(&mut reader).and_then(|v| reader.end().map(|()| v.0));
    value.map_err(|e| {
        let text = e.to_string();
        match text.strip_prefix(MARK) {
            Some(rest) => {
                let key = rest.rsplit_once(" at line ").map_or(rest, |(k, _)| k);
                StrictError::Duplicate(key.to_string())
            }
            None => StrictError::Syntax(text),
        }
    })
}

struct Strict(Value);

impl<'de> Deserialize<'de> for Strict {
    fn deserialize<D: Deserializer<'de>>(deserializer: D) -> Result<Self, D::Error> {
        deserializer.deserialize_any(StrictVisitor).map(Strict)
    }
}

struct StrictVisitor;

impl<'de> Visitor<'de> for StrictVisitor {
    type Value = Value;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("any JSON value")
    }

    fn visit_bool<E>(self, v: bool) -> Result<Value, E> {
        Ok(Value::Bool(v))
    }

    fn visit_i64<E>(self, v: i64) -> Result<Value, E> {
        Ok(Value::Number(v.into()))
    }

    fn visit_u64<E>(self, v: u64) -> Result<Value, E> {
        Ok(Value::Number(v.into()))
    }

    fn visit_f64<E>(self, v: f64) -> Result<Value, E> {
        Ok(Number::from_f64(v).map_or(Value::Null, Value::Number))
    }

    fn visit_str<E>(self, v: &str) -> Result<Value, E> {
        Ok(Value::String(v.to_string()))
    }

    fn visit_string<E>(self, v: String) -> Result<Value, E> {
        Ok(Value::String(v))
    }

    fn visit_unit<E>(self) -> Result<Value, E> {
        Ok(Value::Null)
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Value, A::Error> {
        let mut items = Vec::new();
        while let Some(Strict(item)) = seq.next_element()? {
            items.push(item);
        }
        Ok(Value::Array(items))
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Value, A::Error> {
        let mut object = Map::new();
        while let Some(key) = map.next_key::<String>()? {
            if object.contains_key(&key) {
                return Err(de::Error::custom(format!("{MARK}{key}")));
            }
            let Strict(value) = map.next_value()?;
            object.insert(key, value);
        }
        Ok(Value::Object(object))
    }
}
