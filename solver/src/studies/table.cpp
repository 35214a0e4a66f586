#include "flapline/studies/table.hpp"

#include <charconv>

#include "flapline/simulation/summary_keys.hpp"

namespace flapline::studies {

std::vector<std::string> table_columns(const std::vector<std::string>& varied) {
  std::vector<std::string> c{"case"};
  c.insert(c.end(), varied.begin(), varied.end());
  c.insert(c.end(), {"status", "message", "cycles"});
  for (const SummaryKey& k : summary_keys())
    if (k.path != "run.cycles") c.push_back(k.path);
  return c;
}

std::string csv_field(const std::string& text) {
  const bool quote = text.find_first_of(",\"\n\r") != std::string::npos ||
                     (!text.empty() && (text.front() == ' ' || text.back() == ' '));
  if (!quote) return text;
  std::string out = "\"";
  for (char ch : text) {
    if (ch == '"') out += '"';
    out += (ch == '\n' || ch == '\r') ? ' ' : ch;
  }
  return out + "\"";
}

std::vector<std::string> csv_split(const std::string& line) {
  std::vector<std::string> out(1);
  bool quoted = false;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char ch = line[i];
    if (quoted) {
      if (ch == '"' && i + 1 < line.size() && line[i + 1] == '"') {
        out.back() += '"';
        ++i;
      } else if (ch == '"') {
        quoted = false;
      } else {
        out.back() += ch;
      }
    } else if (ch == '"') {
      quoted = true;
    } else if (ch == ',') {
      out.emplace_back();
    } else {
      out.back() += ch;
    }
  }
  return out;
}

std::string table_header(const std::vector<std::string>& varied) {
  std::string out;
  for (const std::string& c : table_columns(varied)) out += (out.empty() ? "" : ",") + csv_field(c);
  return out + "\n";
}

std::string table_row(std::size_t index, const std::vector<std::string>& varied, const CaseSpec& c,
                      const RunSummary& s) {
  std::string out = std::to_string(index);
  for (const std::string& key : varied) {
    std::string cell;
    for (const Override& o : c.overrides)
      if (o.key == key) cell = o.remove ? "~" : o.text;
    out += "," + csv_field(cell);
  }
  out += "," + std::string(to_string(s.status));
  std::string message = s.message;
  for (char& ch : message)
    if (ch == '\n' || ch == '\r') ch = ' ';
  out += "," + csv_field(message);
  const bool results = has_results(s.status);
  out += "," + (results ? std::to_string(s.cycles) : std::string());
  for (const SummaryKey& k : summary_keys()) {
    if (k.path == "run.cycles") continue;
    out += ",";
    if (!results) continue;
    const std::optional<double> v = k.value(s);
    if (v) out += shortest(*v);
  }
  return out + "\n";
}

long row_index(const std::string& line, std::size_t columns) {
  if (line.empty() || line.back() != '\n') return -1;  // a row cut short by a killed job
  std::string body = line.substr(0, line.size() - 1);
  if (csv_split(body).size() != columns) return -1;
  long index = -1;
  const auto comma = body.find(',');
  const std::string first = body.substr(0, comma);
  const auto r = std::from_chars(first.data(), first.data() + first.size(), index);
  if (r.ec != std::errc() || r.ptr != first.data() + first.size() || index < 0) return -1;
  return index;
}

}  // namespace flapline::studies
