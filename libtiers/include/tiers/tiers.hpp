// Everything public in libtiers, in one include.
#pragma once

#include "tiers/agree.hpp"
#include "tiers/check.hpp"
#include "tiers/diagnostic.hpp"
#include "tiers/format.hpp"
#include "tiers/info.hpp"
#include "tiers/io.hpp"
#include "tiers/lag.hpp"
#include "tiers/merge.hpp"
#include "tiers/model.hpp"
#include "tiers/profile.hpp"
#include "tiers/rules.hpp"
#include "tiers/sink.hpp"
#include "tiers/text.hpp"
#include "tiers/time.hpp"
#include "tiers/version.hpp"
#include "tiers/voices.hpp"
