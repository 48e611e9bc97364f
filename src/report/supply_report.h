/* supply_report.h - what the start-up draws from the supply, as text and
 * as XML: its peak, its average over the start-up, the charge and energy,
 * the time in its current limit and its hiccups. */
#ifndef BR_REPORT_SUPPLY_REPORT_H
#define BR_REPORT_SUPPLY_REPORT_H

#include "analyses/startup.h"
#include "io/xml_write.h"

/* "150 mA constant current", "150 mA folding back to 50 mA", "150 mA,
 * hiccup (off 20 ms after 5 ms in it, 3 retries)", or "none". */
const char *br_supply_limit_words(const br_chain *c, char *buf, size_t cap);
/* The same words for any supply's limit (an injection's: br_stage.inj_lim). */
const char *br_limit_words(const br_climit *l, char *buf, size_t cap);
/* What an injection's line adds about its limit and rating: ", current
 * limit 100 mA, constant current, rated 80 mA", or "" without either. */
const char *br_inject_limit_words(const br_stage *st, char *buf, size_t cap);

/* The supply lines of the start-up section. */
int br_supply_profile_text(const br_chain *c, const br_startup *su, br_text *out);

/* The <supply> element inside <startup>. */
void br_supply_profile_xml(br_xmlw *w, const br_chain *c, const br_startup *su);

#endif
