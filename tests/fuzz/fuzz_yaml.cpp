// libFuzzer target: the YAML loader. Any input must load or report errors,
// each with a message and a position inside the text; and what loads must
// survive the canonical save: load(save(x)) == x, and save is stable
// (DESIGN.md: "YAML -> project -> YAML is lossless", "saving is canonical").
#include "storage/YamlFormat.h"

#include <cstdint>
#include <cstdlib>

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
    const QByteArray text(reinterpret_cast<const char*>(data), qsizetype(size));
    const QString name = QStringLiteral("fuzz.yaml");
    const rb::LoadResult loaded = rb::loadYamlText(text, name);
    if (!loaded.ok()) {
        if (loaded.errors.isEmpty())
            std::abort(); // nothing loaded must come with a reason
        for (const rb::Diagnostic& d : loaded.errors)
            if (d.message.isEmpty() || d.line < 0 || d.column < 0)
                std::abort();
        return 0;
    }
    const QByteArray saved = rb::saveYamlText(*loaded.instrument);
    const rb::LoadResult again = rb::loadYamlText(saved, name);
    if (!again.ok() || !(*again.instrument == *loaded.instrument))
        std::abort(); // the canonical text lost or changed something
    if (rb::saveYamlText(*again.instrument) != saved)
        std::abort(); // saving is not canonical
    return 0;
}
