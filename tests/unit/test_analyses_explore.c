/* test_analyses_explore.c - the Pareto front of an exploration (lower
 * cost, lower gate-supply loss, higher margin) and its ranking, on a
 * hand-made set whose front is worked out by hand below. */
#include "analyses/explore.h"
#include "testkit.h"

#include <string.h>

static br_explore_row row(double cost, double loss, double margin, int state)
{
    br_explore_row r;
    memset(&r, 0, sizeof r);
    r.cost = cost;
    r.loss = loss;
    r.margin = margin;
    r.state = state;
    return r;
}

/* Hand check of each row against the others (cost, loss W, margin V):
 *  0 (10, 0.5, 1.0)  front: cheapest with row 5, and lower loss than 5
 *  1 (12, 0.4, 1.0)  front: lowest loss of all
 *  2 (12, 0.6, 0.9)  dominated by 0 (cheaper, lower loss, more margin)
 *  3 (20, 0.7, 2.0)  front: highest margin
 *  4 (20, 0.7, 2.0)  front: equal to 3 (neither better in anything)
 *  5 (10, 0.6, 1.0)  dominated by 0 (same cost and margin, more loss)
 *  6 ( 5, 0.1, 9.0)  better than all, but not feasible: takes no part
 *  7 (25, 0.8, 1.5)  dominated by 3 */
static void test_front(void)
{
    br_explore_row r[8] = {
        row(10, 0.5, 1.0, BR_EX_FEASIBLE), row(12, 0.4, 1.0, BR_EX_FEASIBLE),
        row(12, 0.6, 0.9, BR_EX_FEASIBLE), row(20, 0.7, 2.0, BR_EX_FEASIBLE),
        row(20, 0.7, 2.0, BR_EX_FEASIBLE), row(10, 0.6, 1.0, BR_EX_FEASIBLE),
        row(5, 0.1, 9.0, BR_EX_MARGIN),    row(25, 0.8, 1.5, BR_EX_FEASIBLE),
    };
    CU_ASSERT_EQUAL(br_explore_pareto(r, 8), 4);
    static const int front[8] = {1, 1, 0, 1, 1, 0, 0, 0};
    for (int i = 0; i < 8; i++)
        CU_ASSERT_EQUAL(r[i].front, front[i]);
}

/* Ranks: the front first (by margin, then cost, then loss; ties in their
 * order), then the rest the same way; a row that is not feasible has no
 * rank.  By hand: front 3, 4 (margin 2), 0 (margin 1, cost 10), 1
 * (margin 1, cost 12); then 7 (margin 1.5), 5 (margin 1), 2 (margin 0.9). */
static void test_rank(void)
{
    br_explore_row r[8] = {
        row(10, 0.5, 1.0, BR_EX_FEASIBLE), row(12, 0.4, 1.0, BR_EX_FEASIBLE),
        row(12, 0.6, 0.9, BR_EX_FEASIBLE), row(20, 0.7, 2.0, BR_EX_FEASIBLE),
        row(20, 0.7, 2.0, BR_EX_FEASIBLE), row(10, 0.6, 1.0, BR_EX_FEASIBLE),
        row(5, 0.1, 9.0, BR_EX_MARGIN),    row(25, 0.8, 1.5, BR_EX_FEASIBLE),
    };
    br_explore_pareto(r, 8);
    static const int rank[8] = {3, 4, 7, 1, 2, 6, 0, 5};
    for (int i = 0; i < 8; i++)
        CU_ASSERT_EQUAL(r[i].rank, rank[i]);
}

/* No feasible row: no front, no rank. */
static void test_none(void)
{
    br_explore_row r[2] = {row(1, 1, 1, BR_EX_FAILS), row(2, 2, 2, BR_EX_RATING)};
    CU_ASSERT_EQUAL(br_explore_pareto(r, 2), 0);
    CU_ASSERT_EQUAL(r[0].front + r[1].front + r[0].rank + r[1].rank, 0);
}

int main(void)
{
    static const br_test_case cases[] = {
        {"the front of a hand-made set", test_front},
        {"the ranking", test_rank},
        {"no feasible row", test_none},
        {NULL, NULL},
    };
    return br_test_main("analyses_explore", cases);
}
