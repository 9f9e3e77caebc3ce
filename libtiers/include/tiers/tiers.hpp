// Everything public in libtiers, in one include.
#pragma once

#include "tiers/diagnostic.hpp"
#include "tiers/format.hpp"
#include "tiers/info.hpp"
#include "tiers/io.hpp"
#include "tiers/model.hpp"
#include "tiers/sink.hpp"
#include "tiers/text.hpp"
#include "tiers/time.hpp"
#include "tiers/version.hpp"
#include "tiers/voices.hpp"
