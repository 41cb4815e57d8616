#include "TrialRunPanel.h"

#include "Icons.h"
#include "PlainText.h"
#include "edit/Document.h"
#include "edit/SetAttributeCommand.h"

#include <QComboBox>
#include <QHBoxLayout>
#include <QLabel>
#include <QLineEdit>
#include <QListWidget>
#include <QPushButton>
#include <QStackedWidget>
#include <QVBoxLayout>

namespace rb {

namespace {
enum Page { CodesPage, MultiPage, ValuePage, NothingPage };
}

TrialRunPanel::TrialRunPanel(Document* document, QWidget* parent)
    : QWidget(parent), m_document(document), m_question(plainLabel(new QLabel)),
      m_detail(plainLabel(new QLabel)), m_inputs(new QStackedWidget), m_codes(new QComboBox),
      m_multi(new QListWidget), m_value(new QLineEdit),
      m_answer(new QPushButton(Icons::get(Icons::Play), tr("&Answer"))),
      m_back(new QPushButton(Icons::get(Icons::Back), tr("Step &back"))),
      m_error(plainLabel(new QLabel)), m_path(new QListWidget), m_respondentName(new QLineEdit),
      m_save(new QPushButton(tr("Save as test respondent"))) {
    m_question->setObjectName(QStringLiteral("trialQuestion"));
    m_question->setWordWrap(true);
    m_detail->setWordWrap(true);
    m_detail->setObjectName(QStringLiteral("panelNote"));
    m_codes->setObjectName(QStringLiteral("trialCodes"));
    m_value->setObjectName(QStringLiteral("trialValue"));
    m_path->setObjectName(QStringLiteral("trialPath"));
    m_error->setObjectName(QStringLiteral("conditionError"));
    m_error->setProperty("problem", true);
    m_respondentName->setPlaceholderText(tr("name of the test respondent"));
    m_respondentName->setObjectName(QStringLiteral("respondentName"));
    m_inputs->addWidget(m_codes);
    m_inputs->addWidget(m_multi);
    m_inputs->addWidget(m_value);
    m_inputs->addWidget(new QLabel(tr("(display only: continue)")));

    auto* restartButton = new QPushButton(tr("&Restart"));
    auto* controls = new QHBoxLayout;
    controls->addWidget(m_answer);
    controls->addWidget(m_back);
    controls->addStretch();
    controls->addWidget(restartButton);
    auto* save = new QHBoxLayout;
    save->addWidget(m_respondentName, 1);
    save->addWidget(m_save);
    auto* layout = new QVBoxLayout(this);
    layout->addWidget(m_question);
    layout->addWidget(m_detail);
    layout->addWidget(m_inputs);
    layout->addLayout(controls);
    layout->addWidget(m_error);
    layout->addWidget(new QLabel(tr("Path so far:")));
    layout->addWidget(m_path, 1);
    layout->addLayout(save);

    connect(m_answer, &QPushButton::clicked, this, [this] { answerWith(currentAnswerText()); });
    connect(m_value, &QLineEdit::returnPressed, m_answer, &QPushButton::click);
    connect(m_back, &QPushButton::clicked, this, &TrialRunPanel::back);
    connect(restartButton, &QPushButton::clicked, this, &TrialRunPanel::restart);
    connect(m_save, &QPushButton::clicked, this,
            [this] { saveAsRespondent(m_respondentName->text().trimmed()); });
    restart();
}

void TrialRunPanel::restart() {
    m_run = std::make_unique<TrialRun>(m_document->instrument());
    m_error->clear();
    display();
}

// The answer the widgets hold, in the form answerWith() reads.
QString TrialRunPanel::currentAnswerText() const {
    switch (m_inputs->currentIndex()) {
    case CodesPage:
        return m_codes->currentData().toString();
    case MultiPage: {
        QStringList codes;
        for (int i = 0; i < m_multi->count(); ++i)
            if (m_multi->item(i)->checkState() == Qt::Checked)
                codes.append(m_multi->item(i)->data(Qt::UserRole).toString());
        return codes.join(u',');
    }
    case ValuePage:
        return m_value->text();
    default:
        return {};
    }
}

QString TrialRunPanel::answerWith(const QString& text) {
    const Item* item = m_run->currentItem();
    if (!item)
        return {};
    AnswerValue value;
    if (item->type == ItemType::Multi) {
        value.kind = AnswerValue::Kind::List;
        for (const QString& part : text.split(u',', Qt::SkipEmptyParts))
            value.codes.append(part.trimmed().toLongLong());
    } else if (item->type == ItemType::Text || item->type == ItemType::Date) {
        value.kind = AnswerValue::Kind::Text;
        value.text = text;
    } else {
        value.kind = AnswerValue::Kind::Number;
        value.text = text.trimmed();
    }
    const QString error = m_run->answer(value);
    m_error->setText(error.isEmpty() ? QString() : tr("Not accepted: %1").arg(error));
    if (error.isEmpty())
        display();
    return error;
}

void TrialRunPanel::back() {
    m_run->back();
    m_error->clear();
    display();
}

bool TrialRunPanel::saveAsRespondent(const QString& name) {
    if (name.isEmpty()) {
        m_error->setText(tr("Give the test respondent a name first."));
        return false;
    }
    QList<TestRespondent> respondents = m_document->instrument().testRespondents;
    respondents.append(m_run->toTestRespondent(name));
    m_document->push(new SetAttributeCommand(m_document,
                                             AttributeKey::instrument(Field::TestRespondents),
                                             respondents, tr("Save test respondent %1").arg(name)));
    m_error->setText(tr("Saved \"%1\"; check replays it.").arg(name));
    return true;
}

void TrialRunPanel::display() {
    m_path->clear();
    m_path->addItems(m_run->path());
    m_back->setEnabled(m_run->canGoBack());
    const Item* item = m_run->currentItem();
    m_answer->setEnabled(item != nullptr);
    m_save->setEnabled(m_run->finished() && m_run->canGoBack());
    if (!item) {
        m_question->setText(m_run->looped() ? tr("The route loops: stopped after 4 x items steps.")
                                            : tr("End of the instrument."));
        m_detail->setText(tr("%n item(s) presented.", nullptr, int(m_run->path().size())));
        m_inputs->setCurrentIndex(NothingPage);
        return;
    }
    m_question->setText(item->text.isEmpty() ? item->name : item->text);
    QString detail = QStringLiteral("%1 (%2)").arg(item->name, itemTypeName(item->type));
    if (item->range)
        detail += tr(", range %1 to %2").arg(item->range->first.text, item->range->second.text);
    if (!item->instruction.isEmpty())
        detail += QStringLiteral(" - ") + item->instruction;
    m_detail->setText(detail);
    const QList<Code> codes = m_run->currentCodes();
    switch (item->type) {
    case ItemType::Single:
        m_codes->clear();
        for (const Code& code : codes)
            m_codes->addItem(QStringLiteral("%1  %2").arg(code.code).arg(code.label),
                             QString::number(code.code));
        m_inputs->setCurrentIndex(CodesPage);
        break;
    case ItemType::Multi:
        m_multi->clear();
        for (const Code& code : codes) {
            auto* entry = new QListWidgetItem(
                QStringLiteral("%1  %2").arg(code.code).arg(code.label), m_multi);
            entry->setData(Qt::UserRole, QString::number(code.code));
            entry->setCheckState(Qt::Unchecked);
        }
        m_inputs->setCurrentIndex(MultiPage);
        break;
    case ItemType::Statement:
        m_inputs->setCurrentIndex(NothingPage);
        break;
    default: {
        m_value->clear();
        QStringList missing;
        for (const Code& code : codes)
            missing.append(QStringLiteral("%1 = %2").arg(code.code).arg(code.label));
        m_value->setPlaceholderText(
            missing.isEmpty() ? tr("a value") : tr("a value, or %1").arg(missing.join(u"; ")));
        m_inputs->setCurrentIndex(ValuePage);
    }
    }
}

} // namespace rb
