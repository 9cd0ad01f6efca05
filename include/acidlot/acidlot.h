/* acidlot: titratable acidity QC library, the whole public interface.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#ifndef ACIDLOT_ACIDLOT_H
#define ACIDLOT_ACIDLOT_H

#include "acidlot/alloc.h"
#include "acidlot/assay.h"
#include "acidlot/chem.h"
#include "acidlot/columns.h"
#include "acidlot/csvread.h"
#include "acidlot/csvwrite.h"
#include "acidlot/curve.h"
#include "acidlot/curves.h"
#include "acidlot/date.h"
#include "acidlot/gum.h"
#include "acidlot/juice.h"
#include "acidlot/number.h"
#include "acidlot/outfile.h"
#include "acidlot/register.h"
#include "acidlot/report.h"
#include "acidlot/result.h"
#include "acidlot/screen.h"
#include "acidlot/screens.h"
#include "acidlot/spec.h"
#include "acidlot/standardize.h"
#include "acidlot/stats.h"
#include "acidlot/status.h"
#include "acidlot/ta.h"
#include "acidlot/table.h"
#include "acidlot/trend.h"
#include "acidlot/units.h"

#endif
