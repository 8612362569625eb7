// The control: compiled against plateau_monitoring, which links ingest, this builds. It shows that
// the failures of the other probes come from the border, not from the way they are built.
#include "daemon/ingest/source_tail.h"
