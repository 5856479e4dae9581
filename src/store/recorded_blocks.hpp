#pragma once
// The rows one audit record describes, read for `audit verify` without building a JSON document: a lab's trail
// holds millions of readings, and a document per record (nodes, maps and strings) costs more than the rest of
// the verification together. The buffers are reused from one record to the next, so memory stays that of the
// largest record. A record that is not in the shape the Recorder writes is read through nlohmann's document
// parser instead (store::recorded_rows), so both always agree on what a record says.
#include <cstddef>
#include <cstdint>
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <vector>

namespace plumb::store {

/// A recorded column value: what the Recorder writes (integer, text, null, the digest of a long text), or any
/// other JSON value an altered record may hold (kept as JSON).
struct RecordedValue {
  enum class Kind { null, integer, text, digest, other };
  Kind kind = Kind::null;
  std::int64_t integer = 0;
  std::string text;  ///< the text, or the SHA-256 hex of a digest
  nlohmann::json other;

  [[nodiscard]] nlohmann::json to_json() const;
};

/// A value of a JSON document as a recorded value (a column default, a row the document parser read).
RecordedValue recorded_value(const nlohmann::json& v);

/// One table's rows in one record: the column names once, then each row's values (row-major).
struct RecordedBlock {
  std::string table;
  std::vector<std::string> columns;  ///< the first `column_count` are in use
  std::size_t column_count = 0;
  std::vector<RecordedValue> values;  ///< the first `row_count * column_count` are in use
  std::size_t row_count = 0;

  [[nodiscard]] const RecordedValue& value(std::size_t row, std::size_t column) const {
    return values[row * column_count + column];
  }
  /// Row `row` as a JSON object, column -> value (for messages and the rare comparisons done on documents).
  [[nodiscard]] nlohmann::json row_json(std::size_t row) const;
};

/// The rows of one audit record, reused from record to record.
class RecordedBlocks {
 public:
  /// Reads what an audit record with `action` and `after_json` describes, as store::recorded_rows does: one row
  /// for "insert" into `table_name`, every row of every table for "insert rows", none otherwise or when the text
  /// is not what the action says.
  void read(std::string_view action, std::string_view table_name, std::string_view after_json);

  [[nodiscard]] std::size_t size() const { return used_; }
  [[nodiscard]] const RecordedBlock& operator[](std::size_t i) const { return blocks_[i]; }

  /// Used by the reader: a fresh block at the end.
  RecordedBlock& add_block();
  void clear() { used_ = 0; }

 private:
  std::vector<RecordedBlock> blocks_;
  std::size_t used_ = 0;
};

}  // namespace plumb::store
