// Compiled against plateau_core only, this must fail: core uses nothing of the daemon.
#include "daemon/presentation/text_table.h"
