#pragma once
// `limitline survey` and `limitline merge`: one unit judged at many sites (a manifest of
// weather files, or a folder of them), each site's ranking, best compliant strategy and,
// with tuning, best setpoints, then a summary by climate zone.
//
// The sites stream: they are read, evaluated and written out in manifest order a chunk at a
// time on every core, so the weather and the hourly results of only a few sites are held at
// once. A survey can be split into shards (row i belongs to shard i mod N + 1), each writing
// a partial result of JSON lines; merging the partials of all N shards gives exactly the
// report the whole survey gives, byte for byte, because the whole survey itself goes through
// the same lines (docs/survey.md).
#include <limitline/analysis/survey.hpp>
#include <limitline/app/year_job.hpp>
#include <limitline/io/codes.hpp>

#include <atomic>
#include <cstddef>
#include <functional>
#include <istream>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace limitline::survey {

// One site of the manifest.
struct ManifestRow {
  std::size_t index = 0;     // 0-based data row
  int line = 0;              // manifest line; 0 for a folder entry
  std::string weather;       // as written
  std::string weather_path;  // resolved against the manifest's folder
  std::string site;          // empty: the weather file's stem
  std::optional<double> elevation_m;
  std::string energy_code, climate_zone;
  std::string unit, unit_path;        // a unit file of its own for this row (as written, resolved)
  std::string origin;                 // "MANIFEST:LINE" for the row's messages
  std::vector<std::string> warnings;  // an implausible elevation, say
};

struct Manifest {
  std::string source;  // as given
  std::vector<ManifestRow> rows;
  std::string bytes;  // what the fingerprint covers: the file, or the folder's listing
};

// The manifest's columns (header names, any case): weather (required), site, elevation,
// energy_code, climate_zone, unit. A folder is a manifest of its *.csv files, sorted by name.
// Bare elevations are in `bare`; a quantity may carry its unit ("850ft"). Errors name the
// file, the line and the column; an unknown column lists the allowed ones.
[[nodiscard]] Manifest read_manifest(const std::string& path, units::System bare);

// A shard "K/N": 1 ≤ K ≤ N ≤ 100000. Row i belongs to shard (i mod N) + 1, so every shard
// gets rows from the whole manifest and the shards of one N cover it once.
struct Shard {
  std::size_t index = 1, count = 1;
  [[nodiscard]] bool has(std::size_t row) const { return row % count == index - 1; }
};
[[nodiscard]] Shard parse_shard(std::string_view text, std::string_view origin = "--shard");

struct SurveyOptions {
  units::System units = units::System::ip;
  bool tune = false;
  unsigned threads = 0;  // 0: all cores
  const std::atomic<bool>* cancel = nullptr;
  // Sites evaluated together before their lines are written; 0: 64, or 8 per thread when
  // there are more than 8 threads, so that the last site of a chunk idles few of them.
  std::size_t chunk = 0;
  // Called with (done, total) of the shard's sites after each chunk, on the calling thread.
  std::function<void(std::size_t, std::size_t)> progress;
};

// Everything every site shares: the template unit as read, the code tables, the settings.
class Survey {
 public:
  // `unit_path`: the unit file every site is judged with (a row's `unit` replaces it).
  Survey(Manifest manifest, const std::string& unit_path, const WeatherOverrides& overrides,
         const SurveyOptions& options);
  ~Survey();
  Survey(const Survey&) = delete;
  Survey& operator=(const Survey&) = delete;

  [[nodiscard]] const SurveyInfo& info() const { return info_; }
  [[nodiscard]] const Manifest& manifest() const { return manifest_; }

  // One site evaluated; a failure is a record with its error (never an exception).
  [[nodiscard]] SiteRecord evaluate(const ManifestRow& row) const;

  // The shard's rows evaluated in parallel, chunk by chunk, each record handed to `emit` in
  // manifest order on the calling thread. Returns false when cancelled (the rows emitted are
  // the ones before the first that did not run).
  bool run(const Shard& shard, const std::function<void(const SiteRecord&)>& emit) const;

 private:
  Manifest manifest_;
  SurveyOptions options_;
  WeatherOverrides overrides_;
  SurveyInfo info_;
  YearInputs base_;
  std::unique_ptr<codes::CodeTables> tables_;
};

// --- Partial results: JSON lines -----------------------------------------------------------
// Line 1: the survey (SurveyInfo) and the shard; then one line per site in manifest order;
// then an end line with the count and whether the shard ran to completion. Every double is
// written in a form that reads back bit for bit.
[[nodiscard]] std::string header_line(const SurveyInfo& info, const Shard& shard);
[[nodiscard]] std::string record_line(const SiteRecord& r);
[[nodiscard]] std::string end_line(std::size_t sites, bool complete);

// A partial file's lines read back; `where` is "FILE:LINE". InputError for anything that is
// not a line limitline wrote.
[[nodiscard]] SurveyInfo parse_header(std::string_view line, std::string_view where, Shard& shard);
[[nodiscard]] SiteRecord parse_record(std::string_view line, std::string_view where);

// The partials of every shard of one survey (any order) merged: each record handed to `emit`
// in manifest order, after every file has been checked to belong to the same survey and the
// shards to cover it exactly once. InputError naming the file and line of the first problem
// (another survey, a shard missing or given twice, an interrupted shard, a cut file).
// Reads each file as a stream: memory does not grow with the number of sites.
[[nodiscard]] SurveyInfo merge_partials(const std::vector<std::string>& files,
                                        const std::function<void(const SiteRecord&)>& emit);

}  // namespace limitline::survey
