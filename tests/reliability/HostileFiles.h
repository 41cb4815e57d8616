#pragma once

#include <QObject>
#include <QTemporaryDir>

// Corrupted and hostile inputs (issue 8): each must give a clear error - no
// crash, no hang, bounded memory - and exit 2 in the CLI.
class TestHostileFiles : public QObject {
    Q_OBJECT
private slots:
    void init();
    void projectFilesInProcess_data();
    void projectFilesInProcess();
    void hostileFilesInCli_data();
    void hostileFilesInCli();
    void ruleToDeletedItemIsAFinding();
    void deepConditionIsASyntaxFinding();
    void longConditionIsChecked();
    void conditionParserLimits();
    void yamlInProcess_data();
    void yamlInProcess();
    void hugeYamlFile();
    void loadingHostileFileWritesNothing();
    void csvReaderLimits();

private:
    QString path(const QString& name) const { return m_dir.filePath(name); }
    QTemporaryDir m_dir;
};
