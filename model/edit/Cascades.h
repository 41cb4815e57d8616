#pragma once

#include "CodeLocation.h"

#include <QStringList>
#include <QUndoCommand>

namespace rb {

class Document;

// What a cascade did besides its main edit, for the status bar and tests.
struct CascadeReport {
    int conditionsRewritten = 0;
    int targetsRewritten = 0;
    int respondentsRewritten = 0;
    // "item: field" of conditions left as they are (they do not parse, or an
    // a..b range / ordering holds a recoded value).
    QStringList leftAsWritten;
};

// Each builder returns one parent command whose children do the whole job, so
// the cascade is one undo step. Nothing is executed until the command is pushed.

// Renames an item and rewrites every condition that reads it, every goto that
// targets it and the test respondents' answers and paths that name it.
QUndoCommand* renameItemCommand(Document* document, int module, int item, const QString& newName,
                                CascadeReport* report = nullptr);
// Renames a module and rewrites the gotos that target it.
QUndoCommand* renameModuleCommand(Document* document, int module, const QString& newName,
                                  CascadeReport* report = nullptr);
// Renames a shared code list and every item that uses it.
QUndoCommand* renameCodeListCommand(Document* document, int codeList, const QString& newName);

// Deletes an item with every rule that targets it.
QUndoCommand* deleteItemCommand(Document* document, int module, int item);
// Deletes a module, its items, and every rule that targets the module or its items.
QUndoCommand* deleteModuleCommand(Document* document, int module);
// Deletes a shared code list; items that used it keep a copy as inline codes
// (so the instrument still loads).
QUndoCommand* deleteCodeListCommand(Document* document, int codeList);

// Changes the number of one code and rewrites the conditions (and test
// respondents' answers) of every item using those codes.
QUndoCommand* recodeCommand(Document* document, const CodeLocation& where, int row, qint64 newCode,
                            CascadeReport* report = nullptr);

} // namespace rb
