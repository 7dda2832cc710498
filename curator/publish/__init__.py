"""Publishing outputs that need Qt's rendering (PDF). Imported only when asked for."""
