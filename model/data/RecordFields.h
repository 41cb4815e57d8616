#pragma once

#include <QByteArrayView>

#include <span>

namespace rb {

// The fields of one record, as views into the bytes they were read from (a
// std::vector of views converts to it).
using RecordFields = std::span<const QByteArrayView>;

} // namespace rb
