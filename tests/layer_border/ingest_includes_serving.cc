// Compiled against plateau_ingest only, this must fail: ingest sits below serving.
#include "daemon/serving/watch_loop.h"
