#include "store/recorded_blocks.hpp"

#include <algorithm>
#include <limits>

#include "store/audit_trail.hpp"

namespace plumb::store {

using nlohmann::json;

RecordedValue recorded_value(const json& v) {
  RecordedValue out;
  if (v.is_null()) return out;
  if (v.is_number_integer() &&
      (!v.is_number_unsigned() || v.get<std::uint64_t>() <= std::numeric_limits<std::int64_t>::max())) {
    out.kind = RecordedValue::Kind::integer;
    out.integer = v.get<std::int64_t>();
  } else if (v.is_string()) {
    out.kind = RecordedValue::Kind::text;
    out.text = v.get<std::string>();
  } else if (v.is_object() && v.size() == 1 && v.contains("sha256") && v["sha256"].is_string()) {
    out.kind = RecordedValue::Kind::digest;
    out.text = v["sha256"].get<std::string>();
  } else {
    out.kind = RecordedValue::Kind::other;
    out.other = v;
  }
  return out;
}

namespace {

/// Reads the shape the Recorder writes, event by event (nlohmann's SAX interface): {"table": {"columns": [...],
/// "rows": [[...], ...]}, ...} for "insert rows", {"column": value, ...} for "insert". Anything else stops the
/// reading (a handler returning false), and the record is read as a document instead.
class RecordedBlocksReader {
 public:
  RecordedBlocksReader(RecordedBlocks& out, bool rows_record, std::string_view table)
      : out_(out), rows_record_(rows_record), single_table_(table) {}

  bool null() {
    if (!in_value()) return false;
    next_value().kind = RecordedValue::Kind::null;
    return after_value();
  }
  bool boolean(bool /*unused*/) { return false; }
  bool number_integer(std::int64_t v) {
    if (!in_value()) return false;
    RecordedValue& r = next_value();
    r.kind = RecordedValue::Kind::integer;
    r.integer = v;
    return after_value();
  }
  bool number_unsigned(std::uint64_t v) {
    if (v > static_cast<std::uint64_t>(std::numeric_limits<std::int64_t>::max())) return false;
    return number_integer(static_cast<std::int64_t>(v));
  }
  bool number_float(double /*unused*/, const std::string& /*unused*/) { return false; }
  bool binary(std::vector<std::uint8_t>& /*unused*/) { return false; }
  bool string(std::string& s) {
    switch (state_) {
      case State::columns: {
        RecordedBlock& b = *block_;
        if (b.column_count == b.columns.size()) b.columns.emplace_back();
        b.columns[b.column_count++].assign(s);
        return true;
      }
      case State::digest_value: {
        RecordedValue& r = next_value();
        r.kind = RecordedValue::Kind::digest;
        r.text.assign(s);
        state_ = State::digest_end;
        return true;
      }
      case State::row:
      case State::object_value: {
        RecordedValue& r = next_value();
        r.kind = RecordedValue::Kind::text;
        r.text.assign(s);
        return after_value();
      }
      default:
        return false;
    }
  }
  bool start_object(std::size_t /*unused*/) {
    switch (state_) {
      case State::start:
        if (rows_record_) {
          state_ = State::root;
        } else {
          start_block(single_table_);
          state_ = State::object_key;
        }
        return true;
      case State::block_start:
        state_ = State::columns_key;
        return true;
      case State::row:
      case State::object_value:
        digest_return_ = state_;
        state_ = State::digest_key;
        return true;
      default:
        return false;
    }
  }
  bool key(std::string& k) {
    switch (state_) {
      case State::root:
        start_block(k);
        state_ = State::block_start;
        return true;
      case State::columns_key:
        state_ = k == "columns" ? State::columns_start : State::failed;
        return k == "columns";
      case State::rows_key:
        state_ = k == "rows" ? State::rows_start : State::failed;
        return k == "rows";
      case State::digest_key:
        state_ = k == "sha256" ? State::digest_value : State::failed;
        return k == "sha256";
      case State::object_key: {
        RecordedBlock& b = *block_;
        if (b.column_count == b.columns.size()) b.columns.emplace_back();
        b.columns[b.column_count++].assign(k);
        state_ = State::object_value;
        return true;
      }
      default:
        return false;
    }
  }
  bool end_object() {
    switch (state_) {
      case State::root:
        state_ = State::done;
        return true;
      case State::block_end:
        state_ = State::root;
        return true;
      case State::digest_end:
        state_ = digest_return_;
        return after_value();
      case State::object_key:
        block_->row_count = 1;
        state_ = State::done;
        return true;
      default:
        return false;
    }
  }
  bool start_array(std::size_t /*unused*/) {
    switch (state_) {
      case State::columns_start:
        state_ = State::columns;
        return true;
      case State::rows_start:
        state_ = State::rows;
        return true;
      case State::rows:
        row_values_ = 0;
        state_ = State::row;
        return true;
      default:
        return false;
    }
  }
  bool end_array() {
    switch (state_) {
      case State::columns:
        state_ = State::rows_key;
        return true;
      case State::rows:
        state_ = State::block_end;
        return true;
      case State::row:
        if (row_values_ != block_->column_count) return false;
        ++block_->row_count;
        state_ = State::rows;
        return true;
      default:
        return false;
    }
  }
  bool parse_error(std::size_t /*unused*/, const std::string& /*unused*/,
                   const nlohmann::detail::exception& /*unused*/) {
    return false;
  }

  [[nodiscard]] bool complete() const { return state_ == State::done; }

 private:
  enum class State {
    start,
    root,
    block_start,
    columns_key,
    columns_start,
    columns,
    rows_key,
    rows_start,
    rows,
    row,
    block_end,
    object_key,
    object_value,
    digest_key,
    digest_value,
    digest_end,
    done,
    failed
  };

  void start_block(const std::string_view table) {
    block_ = &out_.add_block();
    block_->table.assign(table);
  }
  [[nodiscard]] bool in_value() const { return state_ == State::row || state_ == State::object_value; }
  RecordedValue& next_value() {
    RecordedBlock& b = *block_;
    const std::size_t at = rows_record_ ? b.row_count * b.column_count + row_values_ : b.column_count - 1;
    if (at >= b.values.size()) b.values.resize(at + 1);
    return b.values[at];
  }
  bool after_value() {
    if (state_ == State::row) {
      if (++row_values_ > block_->column_count) return false;
    } else {
      state_ = State::object_key;
    }
    return true;
  }

  RecordedBlocks& out_;
  bool rows_record_;
  std::string_view single_table_;
  State state_ = State::start;
  State digest_return_ = State::row;
  RecordedBlock* block_ = nullptr;
  std::size_t row_values_ = 0;
};

bool has_repeats(const std::vector<std::string>& names, std::size_t n) {
  for (std::size_t i = 0; i < n; ++i)
    for (std::size_t j = i + 1; j < n; ++j)
      if (names[i] == names[j]) return true;
  return false;
}

}  // namespace

json RecordedValue::to_json() const {
  switch (kind) {
    case Kind::null:
      return json();
    case Kind::integer:
      return integer;
    case Kind::text:
      return text;
    case Kind::digest:
      return json{{"sha256", text}};
    case Kind::other:
      return other;
  }
  return json();
}

json RecordedBlock::row_json(std::size_t row) const {
  json j = json::object();
  for (std::size_t c = 0; c < column_count; ++c) j[columns[c]] = value(row, c).to_json();
  return j;
}

RecordedBlock& RecordedBlocks::add_block() {
  if (used_ == blocks_.size()) blocks_.emplace_back();
  RecordedBlock& b = blocks_[used_++];
  b.column_count = 0;
  b.row_count = 0;
  return b;
}

void RecordedBlocks::read(std::string_view action, std::string_view table_name, std::string_view after_json) {
  clear();
  const bool rows_record = action == "insert rows";
  if (!rows_record && action != "insert") return;
  RecordedBlocksReader reader(*this, rows_record, table_name);
  bool fast = json::sax_parse(after_json.begin(), after_json.end(), &reader) && reader.complete();
  // A repeated name is read by the document parser as its last value: leave such a record to it.
  for (std::size_t i = 0; fast && i < used_; ++i) {
    fast = !has_repeats(blocks_[i].columns, blocks_[i].column_count);
    for (std::size_t j = i + 1; fast && j < used_; ++j) fast = blocks_[i].table != blocks_[j].table;
  }
  if (fast) {
    // In the order the document parser gives them (its objects keep keys sorted), so that problems are listed alike.
    std::sort(blocks_.begin(), blocks_.begin() + static_cast<std::ptrdiff_t>(used_),
              [](const RecordedBlock& a, const RecordedBlock& b) { return a.table < b.table; });
    return;
  }
  clear();
  AuditRecord record;
  record.action = std::string(action);
  record.table_name = std::string(table_name);
  record.after_json = std::string(after_json);
  for (const auto& [table, row] : recorded_rows(record)) {
    RecordedBlock& b = add_block();
    b.table = table;
    for (const auto& [column, v] : row.items()) {
      if (b.column_count == b.columns.size()) b.columns.emplace_back();
      b.columns[b.column_count] = column;
      if (b.column_count >= b.values.size()) b.values.resize(b.column_count + 1);
      b.values[b.column_count++] = recorded_value(v);
    }
    b.row_count = 1;
  }
}

}  // namespace plumb::store
