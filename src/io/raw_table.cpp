#include <limitline/io/detail/raw_table.hpp>

#include <fmt/format.h>

#include <utility>

namespace limitline {

RawTable::RawTable(std::shared_ptr<const Impl> impl) : impl_(std::move(impl)) {}

bool RawTable::contains(std::string_view key) const { return impl_->table.contains(key); }

namespace detail {

RawTable make_raw_table(toml::table&& table) {
  return RawTable(std::make_shared<const RawTable::Impl>(RawTable::Impl{std::move(table)}));
}

std::string source_origin(const toml::source_region& where, std::string_view key) {
  return fmt::format("{}:{}: {}", where.path ? *where.path : std::string("unit file"),
                     where.begin.line, key);
}

}  // namespace detail
}  // namespace limitline
