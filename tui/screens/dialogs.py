"""Small questions: a choice between a few answers, each on its own key; a file name to save as."""

from __future__ import annotations

from pathlib import Path
from typing import TypeVar

from textual.app import ComposeResult
from textual.await_complete import AwaitComplete
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import Input, Label, Static
from textual.widgets.input import Selection

ResultT = TypeVar("ResultT")


async def _nothing() -> None:
    return None


class Dialog(ModalScreen[ResultT]):
    """A dialog that closes once.

    Keys typed in a burst (a double Enter, Enter then Esc) can reach a dialog after the first
    of them has closed it; Textual's ``dismiss`` takes the top screen off, so a second close
    would take away the screen below (the app's last screen: ScreenStackError). Here a close
    of a dialog that is no longer on top does nothing.
    """

    def dismiss(self, result: ResultT | None = None) -> AwaitComplete:
        if self.app.screen is not self:
            return AwaitComplete(_nothing())
        return super().dismiss(result)


class ChoiceScreen(Dialog[str | None]):
    """A question with a few answers; each answer has a key. Escape picks the escape answer
    (or None when there is none)."""

    DEFAULT_CSS = """
    ChoiceScreen { align: center middle; }
    ChoiceScreen > Vertical {
        width: 64; max-width: 95%; height: auto; border: thick $warning; padding: 1 2;
        background: $surface;
    }
    ChoiceScreen .choice-title { text-style: bold; margin-bottom: 1; }
    ChoiceScreen .choice-keys { margin-top: 1; color: $text-muted; }
    """

    def __init__(self, title: str, question: str, choices: list[tuple[str, str, str]]) -> None:
        super().__init__()
        self.title_text = title
        self.question = question
        self.choices = choices
        self._keys = {key: value for key, value, _ in choices}
        for key, value, label in choices:
            self._bindings.bind(key, f"choose('{value}')", label, show=True)

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(self.title_text, classes="choice-title", markup=False)
            yield Static(self.question, markup=False)
            keys = "   ".join(f"{'Esc' if k == 'escape' else k}: {label}"
                              for k, _, label in self.choices)
            yield Static(keys, classes="choice-keys", markup=False)

    def action_choose(self, value: str) -> None:
        self.dismiss(value)

    def on_key(self, event: object) -> None:
        key = getattr(event, "key", "")
        if key == "escape" and "escape" not in self._keys:
            self.dismiss(None)


class SaveAsScreen(Dialog[Path | None]):
    """Ask for a file name (in ``folder`` unless the person types a path)."""

    BINDINGS = [Binding("escape", "cancel", "Cancel", id="dialog-cancel")]
    DEFAULT_CSS = """
    SaveAsScreen { align: center middle; }
    SaveAsScreen > Vertical {
        width: 72; max-width: 95%; height: auto; border: thick $primary; padding: 1 2;
        background: $surface;
    }
    SaveAsScreen .save-title { text-style: bold; }
    SaveAsScreen .save-folder { color: $text-muted; margin-bottom: 1; }
    SaveAsScreen .save-message { color: $error; }
    """

    def __init__(self, folder: Path, name: str, *, title: str = "Save site as",
                 suffix: str = ".toml", replace_ok: bool = False) -> None:
        super().__init__()
        self.folder = folder
        self.default = name
        self.title_text = title
        self.suffix = suffix
        self.replace_ok = replace_ok

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(self.title_text, classes="save-title", markup=False)
            yield Label(f"in {self.folder} (or type a full path)", classes="save-folder",
                        markup=False)
            yield Input(self.default, id="save-name")
            yield Static("", classes="save-message", markup=False)
            yield Static("Enter: save   Esc: cancel", markup=False)

    def on_mount(self) -> None:
        box = self.query_one(Input)
        box.focus()
        stem_end = len(Path(self.default).stem)
        box.selection = Selection(0, stem_end)

    def target(self, text: str) -> Path | None:
        text = text.strip()
        if not text:
            return None
        path = Path(text).expanduser()
        if not path.is_absolute() and len(path.parts) == 1:
            path = self.folder / path
        if not path.suffix:
            path = path.with_suffix(self.suffix)
        return path

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        path = self.target(event.value)
        message = self.query_one(".save-message", Static)
        if path is None:
            message.update("Type a file name.")
        elif path.is_dir():
            message.update(f"{path} is a folder: type a file name.")
        else:
            self.dismiss(path)

    def action_cancel(self) -> None:
        self.dismiss(None)


class RenameScreen(SaveAsScreen):
    """Ask for the site's name (the title of the site and of its walkdown record)."""

    def __init__(self, name: str) -> None:
        super().__init__(Path("."), name, title="Site name")

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Label(self.title_text, classes="save-title", markup=False)
            yield Label("shown in the title, the site list and the walkdown record",
                        classes="save-folder", markup=False)
            yield Input(self.default, id="save-name")
            yield Static("", classes="save-message", markup=False)
            yield Static("Enter: keep   Esc: cancel", markup=False)

    def on_mount(self) -> None:
        box = self.query_one(Input)
        box.focus()
        box.selection = Selection(0, len(self.default))

    def on_input_submitted(self, event: Input.Submitted) -> None:  # type: ignore[override]
        event.stop()
        name = " ".join(event.value.split())
        if not name:
            self.query_one(".save-message", Static).update("Type a name.")
        else:
            self.dismiss(name)  # type: ignore[arg-type]
