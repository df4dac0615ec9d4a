package capture

import "fifthline/source"

// Source is source.Source, kept here so callers of capture read as before.
type Source = source.Source
