"""Keys act in the order they were typed, however fast they come.

Textual (8.2.8, ``App.on_event``) hands a key to the focused widget's queue at once, but a
key the widget does not take as text (Tab, Enter, Backspace, the arrows) acts only when it
has bubbled up through every container's queue to the app, where the bindings run. While
the app is busy (an edit's engine run and redraw take tens of milliseconds) the next key
reaches the app first and is handed to the widget focused *before* the Tab acts: the first
key after Tab lands in the previous field, a digit typed after Enter on the bend list is
lost, a Backspace deletes the character typed after it.

``KeyOrder`` (mixed into the app) holds each key until the one before it is done: taken by
a widget (stopped), or back at the app with its binding run. A key stopped on its way up
is noticed by polling; a key lost on its way (its widget removed) frees the queue after
``GIVE_UP`` polls.
"""

from __future__ import annotations

from collections import deque
from functools import partial

from textual import events
from textual.app import App

POLL = 0.01  # seconds between looks at a key on its way up
GIVE_UP = 100  # polls (a second or more) before a key is taken as lost on its way up


class KeyOrder(App):
    """An App whose keys reach their widgets one after another, each after the last acted."""

    def __init__(self, *args, **kwargs):
        super().__init__(*args, **kwargs)
        self._keys_held: deque[events.Key] = deque()
        self._key_busy: events.Key | None = None
        self._key_polls = 0

    async def on_event(self, event: events.Event) -> None:
        if isinstance(event, events.Key) and not event.is_forwarded:
            self._keys_held.append(event)  # typed: in line behind any key still acting
            await self._release_keys()
            return
        await super().on_event(event)
        if event is self._key_busy:  # back up at the app: its binding has run
            self._key_done()
            await self._release_keys()

    async def _release_keys(self) -> None:
        while self._keys_held and self._key_busy is None:
            key = self._keys_held.popleft()
            target = self.focused or self.screen
            self._key_busy = key
            await super().on_event(key)  # a priority binding, or handed to ``target``
            if not key.is_forwarded or key._stop_propagation:
                self._key_done()  # acted already
            else:
                self._key_polls = 0
                target.call_later(self._key_looked_at, key)  # right after the widget had it
                self.set_timer(POLL, partial(self._key_poll, key))

    def _key_looked_at(self, key: events.Key) -> None:
        """Done with ``key`` when a widget took it (stopped it); else it is on its way up."""
        if key is self._key_busy and key._stop_propagation:
            self._key_done()
            self.call_later(self._release_keys)

    def _key_poll(self, key: events.Key) -> None:
        if key is not self._key_busy:
            return
        self._key_polls += 1
        if self._key_polls >= GIVE_UP:
            key.stop()
        self._key_looked_at(key)
        if key is self._key_busy:
            self.set_timer(POLL, partial(self._key_poll, key))

    def _key_done(self) -> None:
        self._key_busy = None
