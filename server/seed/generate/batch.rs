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
///
/// Parents are always written before children: before a full batch of a table goes out, every
/// table before it in `order` is flushed, so each row's parent already exists when SQLite
/// checks its foreign keys (immediate checks; deferred ones would make SQLite search the child
/// tables on every parent insert while a violation is pending, which is quadratic where a
/// foreign key has no index). A partial flush is cut into power-of-two statements so that the
/// number of distinct statement texts, and so of prepared statements, stays small.
pub struct Writer {
    order: &'static [Table],
    pending: HashMap<&'static str, Vec<Val>>,
    sql: HashMap<(&'static str, usize), Arc<str>>,
    /// Rows written so far, per table.
    pub written: HashMap<&'static str, u64>,
}

impl Writer {
    /// A writer for the tables of `order`, parents first.
    pub fn new(order: &'static [Table]) -> Self {
        Writer {
            order,
            pending: HashMap::new(),
            sql: HashMap::new(),
            written: HashMap::new(),
        }
    }

    /// Queues one row (its values in the table's column order); when the table has a full
    /// batch, writes its parents' pending rows and then the batch.
    pub async fn push(
        &mut self,
        conn: &mut SqliteConnection,
        table: Table,
        row: Vec<Val>,
    ) -> Result<(), sqlx::Error> {
        debug_assert_eq!(row.len(), table.columns.len(), "{}", table.name);
        let values = self.pending.entry(table.name).or_default();
        values.extend(row);
        if values.len() >= table.batch_rows() * table.columns.len() {
            for parent in self.order.iter().take_while(|t| t.name != table.name) {
                self.write_pending(conn, *parent).await?;
            }
            self.write_pending(conn, table).await?;
        }
        Ok(())
    }

    /// Writes every queued row, parents first (call before commit).
    pub async fn flush(&mut self, conn: &mut SqliteConnection) -> Result<(), sqlx::Error> {
        for table in self.order {
            self.write_pending(conn, *table).await?;
        }
        Ok(())
    }

    /// Writes a table's queued rows: full batches, then the rest in power-of-two statements.
    async fn write_pending(
        &mut self,
        conn: &mut SqliteConnection,
        table: Table,
    ) -> Result<(), sqlx::Error> {
        let Some(values) = self.pending.get_mut(table.name) else {
            return Ok(());
        };
        let mut values = std::mem::take(values).into_iter();
        let width = table.columns.len();
        let mut rows = values.len() / width;
        while rows > 0 {
            let n = if rows >= table.batch_rows() {
                table.batch_rows()
            } else {
                1 << rows.ilog2()
            };
            let chunk: Vec<Val> = values.by_ref().take(n * width).collect();
            self.write(conn, table, chunk).await?;
            rows -= n;
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
