// Compiled against plateau_presentation only, this must fail: presentation sits below monitoring
// (shared/DESIGN.md, daemon's layers), so monitoring's headers are not on its include path.
#include "daemon/monitoring/run_monitor.h"
