/**
 * Initial direction numbers of the Sobol sequence: the first rows of the table of S. Joe and F. Y. Kuo,
 * "Constructing Sobol sequences with better two-dimensional projections", SIAM J. Sci. Comput. 30 (2008)
 * 2635–2654, file `new-joe-kuo-6.21201` (search criterion D^(6), their recommended set; published at
 * https://web.maths.unsw.edu.au/~fkuo/sobol/, BSD licence, copyright 2008 Frances Y. Kuo and Stephen Joe).
 *
 * Copied by hand, rows d = 2 … 40, as `[s, a, m_1 … m_s]`:
 *   s  the degree of the primitive polynomial x^s + c_1 x^(s-1) + … + c_(s-1) x + 1 over GF(2),
 *   a  its inner coefficients c_1 … c_(s-1) as the bits of one integer (c_1 is the most significant),
 *   m  the s initial direction numbers (each m_k odd and below 2^k).
 * Dimension 1 has no row: it is the van der Corput sequence in base 2 (every m_k = 1).
 * The copy was compared with three independent public copies of the table before it was committed.
 */

/** One row of the table: degree, coefficient bits and initial direction numbers. */
export interface DirectionRow {
  readonly s: number;
  readonly a: number;
  readonly m: readonly number[];
}

const row = (s: number, a: number, ...m: number[]): DirectionRow => ({ s, a, m });

/** Rows for dimensions 2 … 40 (index 0 is dimension 2). */
export const JOE_KUO_ROWS: readonly DirectionRow[] = [
  row(1, 0, 1), //                                d = 2
  row(2, 1, 1, 3), //                             d = 3
  row(3, 1, 1, 3, 1), //                          d = 4
  row(3, 2, 1, 1, 1), //                          d = 5
  row(4, 1, 1, 1, 3, 3), //                       d = 6
  row(4, 4, 1, 3, 5, 13), //                      d = 7
  row(5, 2, 1, 1, 5, 5, 17), //                   d = 8
  row(5, 4, 1, 1, 5, 5, 5), //                    d = 9
  row(5, 7, 1, 1, 7, 11, 19), //                  d = 10
  row(5, 11, 1, 1, 5, 1, 1), //                   d = 11
  row(5, 13, 1, 1, 1, 3, 11), //                  d = 12
  row(5, 14, 1, 3, 5, 5, 31), //                  d = 13
  row(6, 1, 1, 3, 3, 9, 7, 49), //                d = 14
  row(6, 13, 1, 1, 1, 15, 21, 21), //             d = 15
  row(6, 16, 1, 3, 1, 13, 27, 49), //             d = 16
  row(6, 19, 1, 1, 1, 15, 7, 5), //               d = 17
  row(6, 22, 1, 3, 1, 15, 13, 25), //             d = 18
  row(6, 25, 1, 1, 5, 5, 19, 61), //              d = 19
  row(7, 1, 1, 3, 7, 11, 23, 15, 103), //         d = 20
  row(7, 4, 1, 3, 7, 13, 13, 15, 69), //          d = 21
  row(7, 7, 1, 1, 3, 13, 7, 35, 63), //           d = 22
  row(7, 8, 1, 3, 5, 9, 1, 25, 53), //            d = 23
  row(7, 14, 1, 3, 1, 13, 9, 35, 107), //         d = 24
  row(7, 19, 1, 3, 1, 5, 27, 61, 31), //          d = 25
  row(7, 21, 1, 1, 5, 11, 19, 41, 61), //         d = 26
  row(7, 28, 1, 3, 5, 3, 3, 13, 69), //           d = 27
  row(7, 31, 1, 1, 7, 13, 1, 19, 1), //           d = 28
  row(7, 32, 1, 3, 7, 5, 13, 19, 59), //          d = 29
  row(7, 37, 1, 1, 3, 9, 25, 29, 41), //          d = 30
  row(7, 41, 1, 3, 5, 13, 23, 1, 55), //          d = 31
  row(7, 42, 1, 3, 7, 3, 13, 59, 17), //          d = 32
  row(7, 50, 1, 3, 1, 3, 5, 53, 69), //           d = 33
  row(7, 55, 1, 1, 5, 5, 23, 33, 13), //          d = 34
  row(7, 56, 1, 1, 7, 7, 1, 61, 123), //          d = 35
  row(7, 59, 1, 1, 7, 9, 13, 61, 49), //          d = 36
  row(7, 62, 1, 3, 3, 5, 3, 55, 33), //           d = 37
  row(8, 14, 1, 3, 1, 15, 31, 13, 49, 245), //    d = 38
  row(8, 21, 1, 3, 5, 15, 31, 59, 63, 97), //     d = 39
  row(8, 22, 1, 3, 1, 11, 11, 11, 77, 249), //    d = 40
];

/** The number of Sobol dimensions this table supports (van der Corput plus one per row). */
export const SOBOL_MAX_DIMENSIONS = JOE_KUO_ROWS.length + 1;
