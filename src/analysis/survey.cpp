#include <limitline/analysis/survey.hpp>
#include <limitline/text.hpp>

#include <algorithm>
#include <cctype>
#include <numeric>

namespace limitline::survey {
namespace {

// Natural order: the leading number as a number ("2A" before "10"), then the rest; no zone
// last.
bool zone_before(const std::string& a, const std::string& b) {
  if (a.empty() != b.empty()) return b.empty();
  const auto lead = [](const std::string& s) {
    std::size_t n = 0;
    while (n < s.size() && std::isdigit(static_cast<unsigned char>(s[n]))) ++n;
    return n;
  };
  const std::size_t na = lead(a), nb = lead(b);
  if (na && nb) {
    const unsigned long va = std::stoul(a.substr(0, std::min<std::size_t>(na, 9)));
    const unsigned long vb = std::stoul(b.substr(0, std::min<std::size_t>(nb, 9)));
    if (va != vb) return va < vb;
  }
  return a < b;
}

bool complies(const std::string& word) { return word.rfind("complies", 0) == 0; }

bool contains(const std::vector<std::string>& v, const std::string& s) {
  return std::find(v.begin(), v.end(), s) != v.end();
}

}  // namespace

double median(std::vector<double> v) {
  if (v.empty()) return 0.0;
  const std::size_t mid = v.size() / 2;
  std::nth_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(mid), v.end());
  const double upper = v[mid];
  if (v.size() % 2) return upper;
  const double lower = *std::max_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(mid));
  return lower + (upper - lower) / 2.0;
}

void SummaryBuilder::add(const SiteRecord& r) {
  const std::string key = text::lower_without_space(r.zone);
  auto z = std::find_if(zones_.begin(), zones_.end(), [&](const Zone& x) { return x.key == key; });
  if (z == zones_.end()) {
    zones_.push_back({key, r.zone, 0, 0, 0, 0, {}, {}});
    z = zones_.end() - 1;
  }
  if (!r.ok) {
    ++z->failed;
    return;
  }
  ++z->ok;
  if (!r.economizer.empty()) {
    ++z->judged;
    if (r.economizer == "required") ++z->required;
  }
  if (!r.code.empty() && !contains(z->codes, r.code)) z->codes.push_back(r.code);
  for (const StrategyFigures& f : r.strategies) {
    auto v = std::find_if(z->strategies.begin(), z->strategies.end(),
                          [&](const Values& x) { return x.name == f.name; });
    if (v == z->strategies.end()) {
      z->strategies.push_back({});
      v = z->strategies.end() - 1;
      v->name = f.name;
    }
    v->shortfall.push_back(f.shortfall);
    if (r.perfect_savings > 0) v->share.push_back(f.shortfall / r.perfect_savings);
    if (contains(r.best, f.name)) ++v->wins;
    if (contains(r.best_compliant, f.name)) ++v->compliant_wins;
    if (complies(f.compliance)) ++v->compliant;
    for (const Setting& s : f.best_setting) {
      auto c = std::find(v->conditions.begin(), v->conditions.end(), s.condition);
      if (c == v->conditions.end()) {
        v->conditions.push_back(s.condition);
        v->kinds.push_back(s.kind);
        v->settings.emplace_back();
        c = v->conditions.end() - 1;
      }
      v->settings[static_cast<std::size_t>(c - v->conditions.begin())].push_back(s.value);
    }
  }
}

std::vector<ZoneSummary> SummaryBuilder::zones() const {
  std::vector<ZoneSummary> out;
  for (const Zone& z : zones_) {
    ZoneSummary s;
    s.zone = z.zone;
    s.sites_ok = z.ok;
    s.sites_failed = z.failed;
    s.codes = z.codes;
    s.economizer_required = z.required;
    s.economizer_judged = z.judged;
    for (const Values& v : z.strategies) {
      StrategySummary t;
      t.name = v.name;
      t.sites = static_cast<int>(v.shortfall.size());
      t.wins = v.wins;
      t.compliant_wins = v.compliant_wins;
      t.compliant = v.compliant;
      t.median_shortfall = median(v.shortfall);
      t.worst_shortfall = *std::max_element(v.shortfall.begin(), v.shortfall.end());
      if (!v.share.empty()) {
        t.median_share = median(v.share);
        t.worst_share = *std::max_element(v.share.begin(), v.share.end());
      }
      t.shares = v.share;
      for (std::size_t c = 0; c < v.conditions.size(); ++c)
        t.median_best_setting.push_back({v.conditions[c], v.kinds[c], median(v.settings[c])});
      s.strategies.push_back(std::move(t));
    }
    // Best first: the lowest median shortfall; equal medians keep the order first seen.
    std::stable_sort(s.strategies.begin(), s.strategies.end(),
                     [](const StrategySummary& a, const StrategySummary& b) {
                       return a.median_shortfall < b.median_shortfall;
                     });
    out.push_back(std::move(s));
  }
  std::vector<std::size_t> order(out.size());
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return zone_before(zones_[a].key, zones_[b].key);
  });
  std::vector<ZoneSummary> sorted;
  sorted.reserve(out.size());
  for (const std::size_t i : order) sorted.push_back(std::move(out[i]));
  return sorted;
}

}  // namespace limitline::survey
