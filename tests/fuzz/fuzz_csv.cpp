// libFuzzer target: the streaming CSV reader. Any input must end in End or in
// an Error with a message and a line inside the file; it must never read past
// its input or loop. A small record limit exercises the length guard.
#include "data/CsvReader.h"

#include <QBuffer>

#include <cstdint>
#include <cstdlib>

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
    QByteArray bytes(reinterpret_cast<const char*>(data), qsizetype(size));
    QBuffer buffer(&bytes);
    buffer.open(QIODevice::ReadOnly);
    rb::CsvReader reader(buffer, QStringLiteral("fuzz.csv"), 4096);
    qint64 lines = 1;
    for (char c : bytes)
        lines += c == '\n';
    // Every record consumes at least one byte, so more records than bytes + 1
    // means the reader is stuck.
    for (size_t records = 0; records <= size + 1; ++records) {
        switch (reader.next()) {
        case rb::CsvReader::Status::Record:
            if (reader.recordLine() < 1 || reader.recordLine() > lines)
                std::abort();
            for (QByteArrayView field : reader.fields())
                if (field.size() > qsizetype(size))
                    std::abort();
            continue;
        case rb::CsvReader::Status::End:
            return 0;
        case rb::CsvReader::Status::Error:
            if (reader.error().message.isEmpty() || reader.error().line < 1 ||
                reader.error().line > lines)
                std::abort();
            return 0;
        }
    }
    std::abort(); // more records than bytes: the reader does not advance
}
