// Must not build: formatters may not reach the jobs that call them.
#include <limitline/app/year_job.hpp>
