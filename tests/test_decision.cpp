// The recommendation (`decision`): the best among what the code allows, the best overall when
// the code turns it down, honest ties, and shares that never round up to 100 %. The
// candidates are invented inputs; the expectations follow from the rules in docs/model.md
// §Recommendation.
#include <doctest/doctest.h>

#include <limitline/analysis/decision.hpp>

using namespace limitline::decision;

TEST_CASE("the best the code allows, and the best overall named when the code refuses it") {
  const Candidate c[] = {{"differential enthalpy", 10.0, "not-allowed"},
                         {"fixed enthalpy + dry-bulb", 250.0, "complies"},
                         {"fixed dry-bulb 65F", 900.0, "complies"},
                         {"fixed dry-bulb 75F", 400.0, "set-wrong"}};
  const Recommendation r = recommend(c, 50.0);
  REQUIRE(r.code_known);
  REQUIRE(r.best.size() == 1);
  CHECK(r.best[0] == 0);
  REQUIRE(r.best_compliant.size() == 1);
  CHECK(r.best_compliant[0] == 1);
  CHECK(r.best_not_allowed());
  CHECK_FALSE(r.all_tied);
}

TEST_CASE(
    "strategies within the tolerance are tied, and a tie with the compliant best is no "
    "refusal") {
  const Candidate c[] = {
      {"a", 100.0, "not-allowed"}, {"b", 104.0, "complies"}, {"c", 120.0, "complies"}};
  const Recommendation r = recommend(c, 5.0);
  CHECK(r.best == std::vector<std::size_t>{0, 1});
  CHECK(r.best_compliant == std::vector<std::size_t>{1});
  CHECK_FALSE(r.best_not_allowed());
}

TEST_CASE("when every strategy ties the choice does not matter") {
  const Candidate c[] = {{"a", 0.0, ""}, {"b", 0.2, ""}, {"c", 0.1, ""}};
  const Recommendation r = recommend(c, tie_tolerance(0.0, false));
  CHECK(r.all_tied);
  CHECK_FALSE(r.code_known);
  CHECK(r.best.front() == 0);
}

TEST_CASE("no compliant strategy: nothing recommended among them") {
  const Candidate c[] = {{"a", 1.0, "not-allowed"}, {"b", 2.0, "set-wrong"}};
  const Recommendation r = recommend(c, 0.5);
  CHECK(r.best_compliant.empty());
  CHECK(r.best_not_allowed());
}

TEST_CASE("the tie tolerance is 0.5 % of the perfect changeover's savings, with a floor") {
  CHECK(tie_tolerance(100000.0, false) == doctest::Approx(500.0));
  CHECK(tie_tolerance(10.0, false) == doctest::Approx(1.0 / 3.412141633));  // 1 kBtu
  CHECK(tie_tolerance(1.0, true) == doctest::Approx(0.01));
}

TEST_CASE("shares never round up to 100 % unless exact") {
  CHECK(share_text(1.0) == "100%");
  CHECK(share_text(0.997) == "99.7%");
  CHECK(share_text(0.99996) == "99.9%");
  CHECK(share_text(0.5) == "50.0%");
  CHECK(share_text(0.0) == "0%");
  CHECK(share_text(0.0004) == "<0.1%");
  CHECK(share_text(-0.25) == "-25.0%");
}
