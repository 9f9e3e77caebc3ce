// Joining speaker tiers into one tier of cues with voices, as WebVTT writes them.
#pragma once

#include <string>
#include <vector>

#include "tiers/model.hpp"

namespace tiers {

/// One tier named `name` holding every annotation of `doc`, in start-time order (ties keep the
/// document's order), each with attribute `speaker` set to its tier's name unless it has one.
/// Media and metadata are kept. What the joined tier cannot keep — each tier's source, parent,
/// vocabulary, attributes and instant kind — is appended to `losses`, one line each.
document join_as_voices(const document& doc, const std::string& name,
                        std::vector<std::string>& losses);

}  // namespace tiers
