//! A record's or an analysis's decision in JSON: `decision` (`fit_for_service`, `restricted`,
//! `remove_from_service`), `decision_words`, `reasons` and `restrictions` (`calc::decision`).

use crate::calc::decision::{self, Decision, Ruling};
use crate::calc::decision_findings;
use crate::calc::quantity::UnitSystem;
use serde_json::{Map, Value, json};

/// The ruling as stored with a record: `{"reasons", "restrictions", "rules"}`.
pub fn stored(r: &Ruling) -> String {
    json!({
        "reasons": r.reason_texts(),
        "restrictions": r.restrictions(),
        "rules": r.reasons.iter().map(|x| x.rule).collect::<Vec<_>>(),
    })
    .to_string()
}

/// Adds `decision`, `decision_words`, `reasons` and `restrictions` to an answer object.
pub fn add(answer: &mut Value, r: &Ruling) {
    if let Value::Object(map) = answer {
        map.extend(fields(r.decision, r.reason_texts(), r.restrictions()));
    }
}

fn fields(d: Decision, reasons: Vec<String>, restrictions: Vec<String>) -> Map<String, Value> {
    let mut map = Map::new();
    map.insert("decision".into(), json!(d.as_str()));
    map.insert("decision_words".into(), json!(d.words()));
    map.insert("reasons".into(), json!(reasons));
    map.insert("restrictions".into(), json!(restrictions));
    map
}

/// A stored record's decision fields. Records stored before decisions were kept are decided
/// now from their stored verdict, diagnosis or result (`decided_from_words` is then true).
pub fn of_record(
    decision: Option<&str>,
    decision_json: Option<&str>,
    words: (Option<&str>, Option<&str>, Option<&str>),
) -> Map<String, Value> {
    if let Some(d) = decision.and_then(Decision::parse) {
        let json: Value = decision_json
            .and_then(|t| serde_json::from_str(t).ok())
            .unwrap_or_default();
        let list = |key: &str| crate::db::status::texts(&json, key);
        let mut map = fields(d, list("reasons"), list("restrictions"));
        map.insert("decided_from_words".into(), json!(false));
        return map;
    }
    let findings = decision_findings::findings_from_words(words.0, words.1, words.2);
    let r = decision::decide(&findings, UnitSystem::Metric);
    let mut map = fields(r.decision, r.reason_texts(), r.restrictions());
    map.insert("decided_from_words".into(), json!(true));
    map
}

/// Adds a stored record's decision fields and its signer (`signed_by`, the account) beside
/// who did the work (`performed_by`, the name written on the record) to its JSON.
pub fn add_to_record(
    answer: &mut Value,
    fields: Map<String, Value>,
    signed_by: &str,
    performed_by: &str,
) {
    if let Value::Object(map) = answer {
        map.extend(fields);
        map.insert("signed_by".into(), json!(signed_by));
        map.insert("performed_by".into(), json!(performed_by));
    }
}
