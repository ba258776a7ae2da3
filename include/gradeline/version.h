#pragma once

namespace gradeline {
inline constexpr const char* kVersion = "0.1.0";
}
