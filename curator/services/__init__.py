"""The API both front ends share: open a catalogue, suggest, report. No Qt here."""
