// How large a review sample needs to be (Cochran 1977), stratum by stratum.
#include "detail/json_text.hpp"
#include "tiers/review.hpp"

namespace tiers {

sample_plan plan_sample(const std::vector<stratum_count>& strata, double margin, double level,
                        double review_rate) {
  sample_plan p;
  p.margin = margin;
  p.level = level;
  p.review_rate = review_rate;
  p.n0 = cochran_n0(margin, level);
  p.total.name = "all strata";
  p.simple.name = "simple random sample";
  for (const stratum_count& s : strata) {
    plan_row r;
    r.name = s.name;
    r.annotations = s.size;
    r.sample = cochran_size(margin, level, s.size);
    r.hours = static_cast<double>(r.sample) / review_rate;
    p.total.annotations += r.annotations;
    p.total.sample += r.sample;
    p.strata.push_back(std::move(r));
  }
  p.total.hours = static_cast<double>(p.total.sample) / review_rate;
  p.simple.annotations = p.total.annotations;
  p.simple.sample = cochran_size(margin, level, p.total.annotations);
  p.simple.hours = static_cast<double>(p.simple.sample) / review_rate;
  return p;
}

namespace {

void write_row(detail::json_writer& j, const plan_row& r, bool named) {
  j.begin_object();
  if (named) j.string("name", r.name);
  j.count("annotations", r.annotations);
  j.count("sample", r.sample);
  j.number("hours", r.hours);
  j.end_object();
}

}  // namespace

void write_sample_plan_json(const sample_plan& p, byte_sink& out) {
  detail::json_writer j(out);
  j.begin_object(true);
  j.string("format", "tiers-sample-plan");
  j.count("version", 1);
  j.number("margin", p.margin);
  j.number("level", p.level);
  j.number("review_rate", p.review_rate);
  j.number("n0", p.n0);
  j.key("strata").begin_array(true);
  for (const plan_row& r : p.strata)
    write_row(j, r, true);
  j.end_array();
  j.key("total");
  write_row(j, p.total, false);
  j.key("simple");
  write_row(j, p.simple, false);
  j.end_object();
  out.write("\n");
}

}  // namespace tiers
