#pragma once

#include "edit/TrialRun.h"

#include <QWidget>

#include <memory>

class QComboBox;
class QLabel;
class QLineEdit;
class QListWidget;
class QPushButton;
class QStackedWidget;

namespace rb {

class Document;

// Plays the instrument as a respondent: the presented item's question, an
// answer taken from its codes or range, the path so far, a step back, and
// saving the run as a test respondent that `check` replays. A run works on a
// copy of the instrument taken when it starts; Restart picks up edits.
class TrialRunPanel : public QWidget {
    Q_OBJECT
public:
    explicit TrialRunPanel(Document* document, QWidget* parent = nullptr);

    void restart();
    // Answers the current item as if typed/chosen (the widgets' path); returns
    // the error shown, or "".
    QString answerWith(const QString& text);
    void back();
    // Stores the run as a test respondent (one undo step). Returns false when
    // the name is empty.
    bool saveAsRespondent(const QString& name);

    const TrialRun* run() const { return m_run.get(); }
    QLabel* questionLabel() const { return m_question; }
    QListWidget* pathList() const { return m_path; }
    QComboBox* codeBox() const { return m_codes; }
    QPushButton* answerButton() const { return m_answer; }

private:
    void display();
    QString currentAnswerText() const;

    Document* m_document;
    std::unique_ptr<TrialRun> m_run;
    QLabel* m_question;
    QLabel* m_detail;
    QStackedWidget* m_inputs;
    QComboBox* m_codes;
    QListWidget* m_multi;
    QLineEdit* m_value;
    QPushButton* m_answer;
    QPushButton* m_back;
    QLabel* m_error;
    QListWidget* m_path;
    QLineEdit* m_respondentName;
    QPushButton* m_save;
};

} // namespace rb
