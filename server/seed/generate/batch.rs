//! Multi-row INSERTs for the scale generator: rows collect per table and go to SQLite as one
//! prepared `INSERT INTO t (...) VALUES (...), (...), ...` statement per batch. The statement
//! text depends only on the table, its columns and the number of rows, so sqlx's statement cache
//! prepares each shape once per connection and reuses it.

use sqlx::{AssertSqlSafe, SqliteConnection};
use std::collections::HashMap;
use std::sync::Arc;

/// One bound value.
#[derive(Clone, Debug, PartialEq)]
pub enum Val {
    Int(i64),
    Real(f64),
    Text(String),
    Null,
}

impl From<i64> for Val {
    fn from(v: i64) -> Self {
        Val::Int(v)
    }
}

impl From<f64> for Val {
    fn from(v: f64) -> Self {
        Val::Real(v)
    }
}

impl From<String> for Val {
    fn from(v: String) -> Self {
        Val::Text(v)
    }
}

impl From<&str> for Val {
    fn from(v: &str) -> Self {
        Val::Text(v.to_string())
    }
}

impl<T: Into<Val>> From<Option<T>> for Val {
    fn from(v: Option<T>) -> Self {
        v.map_or(Val::Null, Into::into)
    }
}

/// A table and the columns the generator fills, in bind order.
#[derive(Clone, Copy, Debug)]
pub struct Table {
    pub name: &'static str,
    pub columns: &'static [&'static str],
}

/// SQLite's default limit on bound parameters per statement is 32,766; stay well below it.
const MAX_PARAMS: usize = 16_000;
/// More rows per statement than this gains little and makes each statement's text long.
const MAX_ROWS: usize = 400;

impl Table {
    /// Rows per full batch for this table.
    pub fn batch_rows(&self) -> usize {
        (MAX_PARAMS / self.columns.len()).clamp(1, MAX_ROWS)
    }
}

/// Rows waiting to be written, per table, and the statement texts built so far.
#[derive(Default)]
pub struct Writer {
    pending: HashMap<&'static str, (Table, Vec<Val>)>,
    sql: HashMap<(&'static str, usize), Arc<str>>,
    /// Rows written so far, per table.
    pub written: HashMap<&'static str, u64>,
}

impl Writer {
    /// Queues one row (its values in the table's column order); writes a batch when full.
    pub async fn push(
        &mut self,
        conn: &mut SqliteConnection,
        table: Table,
        row: Vec<Val>,
    ) -> Result<(), sqlx::Error> {
        debug_assert_eq!(row.len(), table.columns.len(), "{}", table.name);
        let entry = self
            .pending
            .entry(table.name)
            .or_insert_with(|| (table, Vec::new()));
        entry.1.extend(row);
        if entry.1.len() >= table.batch_rows() * table.columns.len() {
            let values = std::mem::take(&mut entry.1);
            self.write(conn, table, values).await?;
        }
        Ok(())
    }

    /// Writes every queued row (call before commit). Parents go first: tables are written in
    /// the order given, the rest after.
    pub async fn flush(
        &mut self,
        conn: &mut SqliteConnection,
        order: &[Table],
    ) -> Result<(), sqlx::Error> {
        for table in order {
            if let Some((t, values)) = self.pending.get_mut(table.name) {
                let (t, values) = (*t, std::mem::take(values));
                self.write(conn, t, values).await?;
            }
        }
        let rest: Vec<(Table, Vec<Val>)> = self
            .pending
            .values_mut()
            .map(|(t, v)| (*t, std::mem::take(v)))
            .filter(|(_, v)| !v.is_empty())
            .collect();
        for (t, values) in rest {
            self.write(conn, t, values).await?;
        }
        Ok(())
    }

    async fn write(
        &mut self,
        conn: &mut SqliteConnection,
        table: Table,
        values: Vec<Val>,
    ) -> Result<(), sqlx::Error> {
        let width = table.columns.len();
        let rows = values.len() / width;
        if rows == 0 {
            return Ok(());
        }
        let sql = self
            .sql
            .entry((table.name, rows))
            .or_insert_with(|| insert_sql(table, rows))
            .clone();
        // The text is made from the table's constant column list and `?` placeholders only;
        // every value is bound.
        let mut query = sqlx::query(AssertSqlSafe(sql));
        for value in values {
            query = match value {
                Val::Int(v) => query.bind(v),
                Val::Real(v) => query.bind(v),
                Val::Text(v) => query.bind(v),
                Val::Null => query.bind(None::<i64>),
            };
        }
        query.execute(&mut *conn).await?;
        *self.written.entry(table.name).or_default() += rows as u64;
        Ok(())
    }
}

/// `INSERT INTO name (a, b) VALUES (?, ?), (?, ?)` for `rows` rows.
fn insert_sql(table: Table, rows: usize) -> Arc<str> {
    let one = format!("({})", vec!["?"; table.columns.len()].join(", "));
    let mut sql = format!(
        "INSERT INTO {} ({}) VALUES ",
        table.name,
        table.columns.join(", ")
    );
    sql.push_str(&vec![one; rows].join(", "));
    sql.into()
}
