/* design_write.h - a design back to a design file, in the vocabulary the
 * reader takes (docs/design-file.md).
 *
 * Every value is written in SI with 17 significant digits, so that the
 * file reads back to the same doubles (angles go through degrees, and
 * come back within a few units in the last place); a toleranced value as
 * min / nominal / max, with its distribution when it is normal.  What the
 * reader derived from other attributes is written as what it derived: a
 * diode given by forward points gets the fitted is, n and rs, one given
 * qrr and if its tau, a switch given rds-on-hot its exponent.  Comments
 * and the layout of the file it came from are not kept. */
#ifndef BR_IO_DESIGN_WRITE_H
#define BR_IO_DESIGN_WRITE_H

#include "model/design.h"

/* Append design d as a complete design file to out.  comment (may be
 * NULL) becomes an XML comment before the root element: each line of it
 * on a line of its own, any "--" in it made "- -" (XML forbids it in a
 * comment).  Returns BR_OK, or BR_ENOMEM with err filled. */
int br_design_write(const br_design *d, const char *comment, br_text *out, br_error *err);

#endif
