// Must not build: the jobs may not reach the study page's server above them.
#include <limitline/serve/api.hpp>
