#pragma once

namespace rb {

// Ids of commands that merge with their predecessor (QUndoCommand::id()).
// Commands that never merge keep the default -1.
enum class CommandId { SetAttribute = 1 };

} // namespace rb
