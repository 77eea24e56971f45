/* qv-element.c — the element and isotope table.
 *
 * Sources.  Every value below was written from memory of these tables, not
 * generated from a library, and then checked against python3-periodictable
 * 1.6 by tests/element/check_elements.py (see that file for tolerances and
 * the listed differences).  periodictable carries older tables (isotope
 * masses from the 1995 mass evaluation, compositions from IUPAC 1997,
 * weights from 1999/2001), so it differs from the values here by up to
 * ~4e-5 u in mass and up to 0.005 in abundance where those were revised;
 * the masses here were also compared, while writing the table, with a
 * second, AME2016-based copy of the NIST tables, and agreed for every
 * isotope both list.
 *
 *  - Isotope masses: NIST "Atomic Weights and Isotopic Compositions", which
 *    takes them from the 2016 Atomic Mass Evaluation (AME2016; Wang et al.,
 *    Chinese Phys. C 41, 030003, 2017) (from memory).  This table uses the
 *    AME2016 values, not AME2020 (the two differ by < 1e-9 u for 1H, 2H).
 *  - Isotopic abundances: IUPAC CIAAW, "Isotopic compositions of the
 *    elements 2013" (Meija et al., Pure Appl. Chem. 88, 293, 2016),
 *    representative values as amount fractions (from memory).
 *  - Standard atomic weights: IUPAC CIAAW 2021 abridged (conventional for
 *    the interval elements H, Li, B, C, N, O, Mg, Si, S, Cl, Ar, Br, Tl, Pb)
 *    (from memory).
 *  - Covalent radii: Cordero et al., "Covalent radii revisited", Dalton
 *    Trans. 2008, 2832 (from memory): C is the sp3 value (0.76 Å; sp2 0.73,
 *    sp 0.69); Mn, Fe, Co are the low-spin values (1.39, 1.32, 1.26 Å;
 *    high spin 1.61, 1.52, 1.50 Å).  The paper has no values above Cm (96).
 *
 * Each isotope mass is written once, in `isotopes`; an element's
 * `isotope_mass` is looked up from there when the element table is first
 * used.
 *
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-element.h"

#include <math.h>
#include <stdlib.h>

/* ------------------------------------------------------------------------
 * Isotopes, sorted by z then mass number.
 *
 * For every element with a natural isotopic composition (CIAAW) all of its
 * natural isotopes are listed with their representative abundance, so each
 * element's abundances sum to 1 within rounding.  Isotopes absent in nature
 * (abundance 0) are the longest-lived isotope of each element that has no
 * natural composition, plus a few radioactive isotopes users label with
 * (3H, 14C, 99Tc, 147Pm, 210Po, 239Pu, 241Am, …).
 *
 * Masses for Z ≥ 95 are the AME2016 values, most of them for the heaviest
 * elements extrapolated ("#" values) rather than measured: approximate,
 * good to ~1e-3 u at best.
 * ---------------------------------------------------------------------- */
static const QvIsotope isotopes[] = {
  /* z  A   mass (u)            abundance */
  {  1,   1,   1.00782503223,   0.999885 },
  {  1,   2,   2.01410177812,   0.000115 },
  {  1,   3,   3.0160492779,    0 },          /* tritium, radioactive */
  {  2,   3,   3.0160293201,    0.00000134 },
  {  2,   4,   4.00260325413,   0.99999866 },
  {  3,   6,   6.0151228874,    0.0759 },
  {  3,   7,   7.0160034366,    0.9241 },
  {  4,   9,   9.012183065,     1 },
  {  5,  10,  10.01293695,      0.199 },
  {  5,  11,  11.00930536,      0.801 },
  {  6,  12,  12.0,             0.9893 },     /* exact by definition of u */
  {  6,  13,  13.00335483507,   0.0107 },
  {  6,  14,  14.0032419884,    0 },          /* radiocarbon, for labels */
  {  7,  14,  14.00307400443,   0.99636 },
  {  7,  15,  15.00010889888,   0.00364 },
  {  8,  16,  15.99491461957,   0.99757 },
  {  8,  17,  16.99913175650,   0.00038 },
  {  8,  18,  17.99915961286,   0.00205 },
  {  9,  19,  18.99840316273,   1 },
  { 10,  20,  19.9924401762,    0.9048 },
  { 10,  21,  20.993846685,     0.0027 },
  { 10,  22,  21.991385114,     0.0925 },
  { 11,  23,  22.9897692820,    1 },
  { 12,  24,  23.985041697,     0.7899 },
  { 12,  25,  24.985836976,     0.1000 },
  { 12,  26,  25.982592968,     0.1101 },
  { 13,  27,  26.98153853,      1 },
  { 14,  28,  27.97692653465,   0.92223 },
  { 14,  29,  28.97649466490,   0.04685 },
  { 14,  30,  29.973770136,     0.03092 },
  { 15,  31,  30.97376199842,   1 },
  { 16,  32,  31.9720711744,    0.9499 },
  { 16,  33,  32.9714589098,    0.0075 },
  { 16,  34,  33.967867004,     0.0425 },
  { 16,  36,  35.96708071,      0.0001 },
  { 17,  35,  34.968852682,     0.7576 },
  { 17,  37,  36.965902602,     0.2424 },
  { 18,  36,  35.967545105,     0.003336 },
  { 18,  38,  37.96273211,      0.000629 },
  { 18,  40,  39.9623831237,    0.996035 },
  { 19,  39,  38.9637064864,    0.932581 },
  { 19,  40,  39.963998166,     0.000117 },
  { 19,  41,  40.9618252579,    0.067302 },
  { 20,  40,  39.962590863,     0.96941 },
  { 20,  42,  41.95861783,      0.00647 },
  { 20,  43,  42.95876644,      0.00135 },
  { 20,  44,  43.95548156,      0.02086 },
  { 20,  46,  45.9536890,       0.00004 },
  { 20,  48,  47.95252276,      0.00187 },
  { 21,  45,  44.95590828,      1 },
  { 22,  46,  45.95262772,      0.0825 },
  { 22,  47,  46.95175879,      0.0744 },
  { 22,  48,  47.94794198,      0.7372 },
  { 22,  49,  48.94786568,      0.0541 },
  { 22,  50,  49.94478689,      0.0518 },
  { 23,  50,  49.94715601,      0.00250 },
  { 23,  51,  50.94395704,      0.99750 },
  { 24,  50,  49.94604183,      0.04345 },
  { 24,  52,  51.94050623,      0.83789 },
  { 24,  53,  52.94064815,      0.09501 },
  { 24,  54,  53.93887916,      0.02365 },
  { 25,  55,  54.93804391,      1 },
  { 26,  54,  53.93960899,      0.05845 },
  { 26,  56,  55.93493633,      0.91754 },
  { 26,  57,  56.93539284,      0.02119 },
  { 26,  58,  57.93327443,      0.00282 },
  { 27,  59,  58.93319429,      1 },
  { 28,  58,  57.93534241,      0.680769 },
  { 28,  60,  59.93078588,      0.262231 },
  { 28,  61,  60.93105557,      0.011399 },
  { 28,  62,  61.92834537,      0.036345 },
  { 28,  64,  63.92796682,      0.009256 },
  { 29,  63,  62.92959772,      0.6915 },
  { 29,  65,  64.92778970,      0.3085 },
  { 30,  64,  63.92914201,      0.4917 },
  { 30,  66,  65.92603381,      0.2773 },
  { 30,  67,  66.92712775,      0.0404 },
  { 30,  68,  67.92484455,      0.1845 },
  { 30,  70,  69.9253192,       0.0061 },
  { 31,  69,  68.9255735,       0.60108 },
  { 31,  71,  70.92470258,      0.39892 },
  /* Ge, Se: the CIAAW 2013 compositions (Meija et al. 2016, from memory),
     which reproduce the revised weights 72.630 and 78.971 to 1e-5; older
     tables, and NIST's compilation, list 70Ge 0.2057 … and 80Se 0.4961 … */
  { 32,  70,  69.92424875,      0.2052 },
  { 32,  72,  71.922075826,     0.2745 },
  { 32,  73,  72.923458956,     0.0776 },
  { 32,  74,  73.921177761,     0.3652 },
  { 32,  76,  75.921402726,     0.0775 },
  { 33,  75,  74.92159457,      1 },
  { 34,  74,  73.922475934,     0.0086 },
  { 34,  76,  75.919213704,     0.0923 },
  { 34,  77,  76.919914154,     0.0760 },
  { 34,  78,  77.91730928,      0.2369 },
  { 34,  80,  79.9165218,       0.4980 },
  { 34,  82,  81.9166995,       0.0882 },
  { 35,  79,  78.9183376,       0.5069 },
  { 35,  81,  80.9162897,       0.4931 },
  { 36,  78,  77.92036494,      0.00355 },
  { 36,  80,  79.91637808,      0.02286 },
  { 36,  82,  81.91348273,      0.11593 },
  { 36,  83,  82.91412716,      0.11500 },
  { 36,  84,  83.9114977282,    0.56987 },
  { 36,  86,  85.9106106269,    0.17279 },
  { 37,  85,  84.9117897379,    0.7217 },
  { 37,  87,  86.9091805310,    0.2783 },
  { 38,  84,  83.9134191,       0.0056 },
  { 38,  86,  85.9092606,       0.0986 },
  { 38,  87,  86.9088775,       0.0700 },
  { 38,  88,  87.9056125,       0.8258 },
  { 39,  89,  88.9058403,       1 },
  { 40,  90,  89.9046977,       0.5145 },
  { 40,  91,  90.9056396,       0.1122 },
  { 40,  92,  91.9050347,       0.1715 },
  { 40,  94,  93.9063108,       0.1738 },
  { 40,  96,  95.9082714,       0.0280 },
  { 41,  93,  92.9063730,       1 },
  { 42,  92,  91.90680796,      0.1453 },
  { 42,  94,  93.90508490,      0.0915 },
  { 42,  95,  94.90583877,      0.1584 },
  { 42,  96,  95.90467612,      0.1667 },
  { 42,  97,  96.90601812,      0.0960 },
  { 42,  98,  97.90540482,      0.2439 },
  { 42, 100,  99.9074718,       0.0982 },
  /* Tc: no natural isotope.  97Tc (4.21 Myr) and 98Tc (4.2 Myr) have the
     same half-life within their uncertainties; the element row uses 98Tc,
     the mass number NIST lists for Tc.  99Tc is the one met in practice. */
  { 43,  97,  96.9063667,       0 },
  { 43,  98,  97.9072124,       0 },
  { 43,  99,  98.9062508,       0 },
  { 44,  96,  95.90759025,      0.0554 },
  { 44,  98,  97.9052868,       0.0187 },
  { 44,  99,  98.9059341,       0.1276 },
  { 44, 100,  99.9042143,       0.1260 },
  { 44, 101, 100.9055769,       0.1706 },
  { 44, 102, 101.9043441,       0.3155 },
  { 44, 104, 103.9054275,       0.1862 },
  { 45, 103, 102.9054980,       1 },
  { 46, 102, 101.9056022,       0.0102 },
  { 46, 104, 103.9040305,       0.1114 },
  { 46, 105, 104.9050796,       0.2233 },
  { 46, 106, 105.9034804,       0.2733 },
  { 46, 108, 107.9038916,       0.2646 },
  { 46, 110, 109.90517220,      0.1172 },
  { 47, 107, 106.9050916,       0.51839 },
  { 47, 109, 108.9047553,       0.48161 },
  { 48, 106, 105.9064599,       0.0125 },
  { 48, 108, 107.9041834,       0.0089 },
  { 48, 110, 109.90300661,      0.1249 },
  { 48, 111, 110.90418287,      0.1280 },
  { 48, 112, 111.90276287,      0.2413 },
  { 48, 113, 112.90440813,      0.1222 },
  { 48, 114, 113.90336509,      0.2873 },
  { 48, 116, 115.90476315,      0.0749 },
  { 49, 113, 112.90406184,      0.0429 },
  { 49, 115, 114.903878776,     0.9571 },
  { 50, 112, 111.90482387,      0.0097 },
  { 50, 114, 113.9027827,       0.0066 },
  { 50, 115, 114.903344699,     0.0034 },
  { 50, 116, 115.90174280,      0.1454 },
  { 50, 117, 116.90295398,      0.0768 },
  { 50, 118, 117.90160657,      0.2422 },
  { 50, 119, 118.90331117,      0.0859 },
  { 50, 120, 119.90220163,      0.3258 },
  { 50, 122, 121.9034438,       0.0463 },
  { 50, 124, 123.9052766,       0.0579 },
  { 51, 121, 120.9038120,       0.5721 },
  { 51, 123, 122.9042132,       0.4279 },
  { 52, 120, 119.9040593,       0.0009 },
  { 52, 122, 121.9030435,       0.0255 },
  { 52, 123, 122.9042698,       0.0089 },
  { 52, 124, 123.9028171,       0.0474 },
  { 52, 125, 124.9044299,       0.0707 },
  { 52, 126, 125.9033109,       0.1884 },
  { 52, 128, 127.90446128,      0.3174 },
  { 52, 130, 129.906222748,     0.3408 },
  { 53, 127, 126.9044719,       1 },
  { 54, 124, 123.9058920,       0.000952 },
  { 54, 126, 125.9042983,       0.000890 },
  { 54, 128, 127.9035310,       0.019102 },
  { 54, 129, 128.9047808611,    0.264006 },
  { 54, 130, 129.903509349,     0.040710 },
  { 54, 131, 130.90508406,      0.212324 },
  { 54, 132, 131.9041550856,    0.269086 },
  { 54, 134, 133.90539466,      0.104357 },
  { 54, 136, 135.907214484,     0.088573 },
  { 55, 133, 132.9054519610,    1 },
  { 56, 130, 129.9063207,       0.00106 },
  { 56, 132, 131.9050611,       0.00101 },
  { 56, 134, 133.90450818,      0.02417 },
  { 56, 135, 134.90568838,      0.06592 },
  { 56, 136, 135.90457573,      0.07854 },
  { 56, 137, 136.90582714,      0.11232 },
  { 56, 138, 137.90524700,      0.71698 },
  { 57, 138, 137.9071149,       0.0008881 },
  { 57, 139, 138.9063563,       0.9991119 },
  { 58, 136, 135.90712921,      0.00185 },
  { 58, 138, 137.905991,        0.00251 },
  { 58, 140, 139.9054431,       0.88450 },
  { 58, 142, 141.9092504,       0.11114 },
  { 59, 141, 140.9076576,       1 },
  { 60, 142, 141.9077290,       0.27152 },
  { 60, 143, 142.9098200,       0.12174 },
  { 60, 144, 143.9100930,       0.23798 },
  { 60, 145, 144.9125793,       0.08293 },
  { 60, 146, 145.9131226,       0.17189 },
  { 60, 148, 147.9168993,       0.05756 },
  { 60, 150, 149.9209022,       0.05638 },
  /* Pm: no natural isotope; 145Pm (17.7 y) is the longest-lived. */
  { 61, 145, 144.9127559,       0 },
  { 61, 147, 146.9151450,       0 },
  { 62, 144, 143.9120065,       0.0307 },
  { 62, 147, 146.9149044,       0.1499 },
  { 62, 148, 147.9148292,       0.1124 },
  { 62, 149, 148.9171921,       0.1382 },
  { 62, 150, 149.9172829,       0.0738 },
  { 62, 152, 151.9197397,       0.2675 },
  { 62, 154, 153.9222169,       0.2275 },
  { 63, 151, 150.9198578,       0.4781 },
  { 63, 153, 152.9212380,       0.5219 },
  { 64, 152, 151.9197995,       0.0020 },
  { 64, 154, 153.9208741,       0.0218 },
  { 64, 155, 154.9226305,       0.1480 },
  { 64, 156, 155.9221312,       0.2047 },
  { 64, 157, 156.9239686,       0.1565 },
  { 64, 158, 157.9241123,       0.2484 },
  { 64, 160, 159.9270624,       0.2186 },
  { 65, 159, 158.9253547,       1 },
  { 66, 156, 155.9242847,       0.00056 },
  { 66, 158, 157.9244159,       0.00095 },
  { 66, 160, 159.9252046,       0.02329 },
  { 66, 161, 160.9269405,       0.18889 },
  { 66, 162, 161.9268056,       0.25475 },
  { 66, 163, 162.9287383,       0.24896 },
  { 66, 164, 163.9291819,       0.28260 },
  { 67, 165, 164.9303288,       1 },
  { 68, 162, 161.9287884,       0.00139 },
  { 68, 164, 163.9292088,       0.01601 },
  { 68, 166, 165.9302995,       0.33503 },
  { 68, 167, 166.9320546,       0.22869 },
  { 68, 168, 167.9323767,       0.26978 },
  { 68, 170, 169.9354702,       0.14910 },
  { 69, 169, 168.9342179,       1 },
  { 70, 168, 167.9338896,       0.00123 },
  { 70, 170, 169.9347664,       0.02982 },
  { 70, 171, 170.9363302,       0.1409 },
  { 70, 172, 171.9363859,       0.2168 },
  { 70, 173, 172.9382151,       0.16103 },
  { 70, 174, 173.9388664,       0.32026 },
  { 70, 176, 175.9425764,       0.12996 },
  { 71, 175, 174.9407752,       0.97401 },
  { 71, 176, 175.9426897,       0.02599 },
  { 72, 174, 173.9400461,       0.0016 },
  { 72, 176, 175.9414076,       0.0526 },
  { 72, 177, 176.9432277,       0.1860 },
  { 72, 178, 177.9437058,       0.2728 },
  { 72, 179, 178.9458232,       0.1362 },
  { 72, 180, 179.9465570,       0.3508 },
  { 73, 180, 179.9474648,       0.0001201 },
  { 73, 181, 180.9479958,       0.9998799 },
  { 74, 180, 179.9467108,       0.0012 },
  { 74, 182, 181.94820394,      0.2650 },
  { 74, 183, 182.95022275,      0.1431 },
  { 74, 184, 183.95093092,      0.3064 },
  { 74, 186, 185.9543628,       0.2843 },
  { 75, 185, 184.9529545,       0.3740 },
  { 75, 187, 186.9557501,       0.6260 },
  { 76, 184, 183.9524885,       0.0002 },
  { 76, 186, 185.9538350,       0.0159 },
  { 76, 187, 186.9557474,       0.0196 },
  { 76, 188, 187.9558352,       0.1324 },
  { 76, 189, 188.9581442,       0.1615 },
  { 76, 190, 189.9584437,       0.2626 },
  { 76, 192, 191.9614770,       0.4078 },
  { 77, 191, 190.9605893,       0.373 },
  { 77, 193, 192.9629216,       0.627 },
  { 78, 190, 189.9599297,       0.00012 },
  { 78, 192, 191.9610387,       0.00782 },
  { 78, 194, 193.9626809,       0.3286 },
  { 78, 195, 194.9647917,       0.3378 },
  { 78, 196, 195.96495209,      0.2521 },
  { 78, 198, 197.9678949,       0.07356 },
  { 79, 197, 196.96656879,      1 },
  { 80, 196, 195.9658326,       0.0015 },
  { 80, 198, 197.96676860,      0.0997 },
  { 80, 199, 198.96828064,      0.1687 },
  { 80, 200, 199.96832659,      0.2310 },
  { 80, 201, 200.97030284,      0.1318 },
  { 80, 202, 201.97064340,      0.2986 },
  { 80, 204, 203.97349398,      0.0687 },
  { 81, 203, 202.9723446,       0.2952 },
  { 81, 205, 204.9744278,       0.7048 },
  { 82, 204, 203.9730440,       0.014 },
  { 82, 206, 205.9744657,       0.241 },
  { 82, 207, 206.9758973,       0.221 },
  { 82, 208, 207.9766525,       0.524 },
  { 83, 209, 208.9803991,       1 },
  /* Po … Ac: no natural composition; the first of each is the
     longest-lived isotope: 209Po (124 y), 210At (8.1 h), 222Rn (3.82 d),
     223Fr (22 min), 226Ra (1600 y), 227Ac (21.8 y). */
  { 84, 209, 208.9824308,       0 },
  { 84, 210, 209.9828741,       0 },
  { 85, 210, 209.9871479,       0 },
  { 85, 211, 210.9874966,       0 },
  { 86, 222, 222.0175782,       0 },
  { 87, 223, 223.0197360,       0 },
  { 88, 226, 226.0254103,       0 },
  { 89, 227, 227.0277523,       0 },
  { 90, 232, 232.0380558,       1 },
  { 91, 231, 231.0358842,       1 },
  { 92, 234, 234.0409523,       0.000054 },
  { 92, 235, 235.0439301,       0.007204 },
  { 92, 238, 238.0507884,       0.992742 },
  /* Np, Pu: no natural composition; 237Np (2.14 Myr) and 244Pu (80 Myr)
     are the longest-lived. */
  { 93, 237, 237.0481736,       0 },
  { 94, 238, 238.0495601,       0 },
  { 94, 239, 239.0521636,       0 },
  { 94, 240, 240.0538138,       0 },
  { 94, 244, 244.0642053,       0 },
  /* Z ≥ 95: longest-lived known isotope first (approximate masses, see the
     head of the table): 243Am (7370 y), 247Cm (15.6 Myr), 247Bk (1380 y),
     251Cf (898 y), 252Es (472 d), 257Fm (100 d), 258Md (51 d),
     259No (58 min), 266Lr (11 h), 267Rf (~1.3 h), 268Db (~1 d),
     269Sg (~14 min), 270Bh (~1 min), 269Hs (~10 s), 278Mt (~5 s),
     281Ds (~13 s), 282Rg (~2 min), 285Cn (~30 s), 286Nh (~10 s),
     289Fl (~2 s), 290Mc (~0.7 s), 293Lv (~60 ms), 294Ts (~50 ms),
     294Og (~0.7 ms).  For the superheavy elements the "longest-lived" is
     the longest-lived of the few isotopes made so far and may change. */
  { 95, 241, 241.0568293,       0 },
  { 95, 243, 243.0613813,       0 },
  { 96, 244, 244.0627528,       0 },
  { 96, 247, 247.0703541,       0 },
  { 97, 247, 247.0703073,       0 },
  { 98, 251, 251.0795886,       0 },
  { 99, 252, 252.082980,        0 },
  {100, 257, 257.0951061,       0 },
  {101, 258, 258.0984315,       0 },
  {102, 259, 259.10103,         0 },
  {103, 266, 266.11983,         0 },
  {104, 267, 267.12179,         0 },
  {105, 268, 268.12567,         0 },
  {106, 269, 269.12863,         0 },
  {107, 270, 270.13336,         0 },
  {108, 269, 269.13375,         0 },
  {109, 278, 278.15631,         0 },
  {110, 281, 281.16451,         0 },
  {111, 282, 282.16912,         0 },
  {112, 285, 285.17712,         0 },
  {113, 286, 286.18221,         0 },
  {114, 289, 289.19042,         0 },
  {115, 290, 290.19598,         0 },
  {116, 293, 293.20449,         0 },
  {117, 294, 294.21046,         0 },
  {118, 294, 294.21392,         0 },
};

/* ------------------------------------------------------------------------
 * Elements.  `a` is the reference isotope (see QvElement.mass_number); its
 * mass comes from `isotopes`.  `nat` is TRUE when CIAAW gives the element a
 * natural isotopic composition (this includes Bi, Th, Pa and U, whose
 * isotopes are radioactive but long-lived enough to occur in nature with a
 * known composition); FALSE for Tc, Pm, Po–Ac and Z ≥ 93, where `a` is the
 * longest-lived isotope.  `w` is the standard atomic weight, `r` the
 * covalent radius (sources at the top of the file).
 * ---------------------------------------------------------------------- */
typedef struct {
  const char *symbol;
  const char *name;
  guint a;
  gboolean nat;
  double w;
  double r;
} ElementRow;

#define N NAN

/* Indexed by z − 1. */
static const ElementRow element_rows[QV_ELEMENT_MAX_Z] = {
  /* symbol name              A  natural  weight    radius */
  { "H",  "hydrogen",          1, TRUE,    1.008,   0.31 },
  { "He", "helium",            4, TRUE,    4.0026,  0.28 },
  { "Li", "lithium",           7, TRUE,    6.94,    1.28 },
  { "Be", "beryllium",         9, TRUE,    9.0122,  0.96 },
  { "B",  "boron",            11, TRUE,   10.81,    0.84 },
  { "C",  "carbon",           12, TRUE,   12.011,   0.76 },  /* sp3 */
  { "N",  "nitrogen",         14, TRUE,   14.007,   0.71 },
  { "O",  "oxygen",           16, TRUE,   15.999,   0.66 },
  { "F",  "fluorine",         19, TRUE,   18.998,   0.57 },
  { "Ne", "neon",             20, TRUE,   20.180,   0.58 },
  { "Na", "sodium",           23, TRUE,   22.990,   1.66 },
  { "Mg", "magnesium",        24, TRUE,   24.305,   1.41 },
  { "Al", "aluminium",        27, TRUE,   26.982,   1.21 },
  { "Si", "silicon",          28, TRUE,   28.085,   1.11 },
  { "P",  "phosphorus",       31, TRUE,   30.974,   1.07 },
  { "S",  "sulfur",           32, TRUE,   32.06,    1.05 },
  { "Cl", "chlorine",         35, TRUE,   35.45,    1.02 },
  { "Ar", "argon",            40, TRUE,   39.95,    1.06 },
  { "K",  "potassium",        39, TRUE,   39.098,   2.03 },
  { "Ca", "calcium",          40, TRUE,   40.078,   1.76 },
  { "Sc", "scandium",         45, TRUE,   44.956,   1.70 },
  { "Ti", "titanium",         48, TRUE,   47.867,   1.60 },
  { "V",  "vanadium",         51, TRUE,   50.942,   1.53 },
  { "Cr", "chromium",         52, TRUE,   51.996,   1.39 },
  { "Mn", "manganese",        55, TRUE,   54.938,   1.39 },  /* low spin */
  { "Fe", "iron",             56, TRUE,   55.845,   1.32 },  /* low spin */
  { "Co", "cobalt",           59, TRUE,   58.933,   1.26 },  /* low spin */
  { "Ni", "nickel",           58, TRUE,   58.693,   1.24 },
  { "Cu", "copper",           63, TRUE,   63.546,   1.32 },
  { "Zn", "zinc",             64, TRUE,   65.38,    1.22 },
  { "Ga", "gallium",          69, TRUE,   69.723,   1.22 },
  { "Ge", "germanium",        74, TRUE,   72.630,   1.20 },
  { "As", "arsenic",          75, TRUE,   74.922,   1.19 },
  { "Se", "selenium",         80, TRUE,   78.971,   1.20 },
  { "Br", "bromine",          79, TRUE,   79.904,   1.20 },
  { "Kr", "krypton",          84, TRUE,   83.798,   1.16 },
  { "Rb", "rubidium",         85, TRUE,   85.468,   2.20 },
  { "Sr", "strontium",        88, TRUE,   87.62,    1.95 },
  { "Y",  "yttrium",          89, TRUE,   88.906,   1.90 },
  { "Zr", "zirconium",        90, TRUE,   91.224,   1.75 },
  { "Nb", "niobium",          93, TRUE,   92.906,   1.64 },
  { "Mo", "molybdenum",       98, TRUE,   95.95,    1.54 },
  { "Tc", "technetium",       98, FALSE,  N,        1.47 },
  { "Ru", "ruthenium",       102, TRUE,  101.07,    1.46 },
  { "Rh", "rhodium",         103, TRUE,  102.91,    1.42 },
  { "Pd", "palladium",       106, TRUE,  106.42,    1.39 },
  { "Ag", "silver",          107, TRUE,  107.87,    1.45 },
  { "Cd", "cadmium",         114, TRUE,  112.41,    1.44 },
  { "In", "indium",          115, TRUE,  114.82,    1.42 },
  { "Sn", "tin",             120, TRUE,  118.71,    1.39 },
  { "Sb", "antimony",        121, TRUE,  121.76,    1.39 },
  { "Te", "tellurium",       130, TRUE,  127.60,    1.38 },
  { "I",  "iodine",          127, TRUE,  126.90,    1.39 },
  { "Xe", "xenon",           132, TRUE,  131.29,    1.40 },
  { "Cs", "caesium",         133, TRUE,  132.91,    2.44 },
  { "Ba", "barium",          138, TRUE,  137.33,    2.15 },
  { "La", "lanthanum",       139, TRUE,  138.91,    2.07 },
  { "Ce", "cerium",          140, TRUE,  140.12,    2.04 },
  { "Pr", "praseodymium",    141, TRUE,  140.91,    2.03 },
  { "Nd", "neodymium",       142, TRUE,  144.24,    2.01 },
  { "Pm", "promethium",      145, FALSE,  N,        1.99 },
  { "Sm", "samarium",        152, TRUE,  150.36,    1.98 },
  { "Eu", "europium",        153, TRUE,  151.96,    1.98 },
  { "Gd", "gadolinium",      158, TRUE,  157.25,    1.96 },
  { "Tb", "terbium",         159, TRUE,  158.93,    1.94 },
  { "Dy", "dysprosium",      164, TRUE,  162.50,    1.92 },
  { "Ho", "holmium",         165, TRUE,  164.93,    1.92 },
  { "Er", "erbium",          166, TRUE,  167.26,    1.89 },
  { "Tm", "thulium",         169, TRUE,  168.93,    1.90 },
  { "Yb", "ytterbium",       174, TRUE,  173.05,    1.87 },
  { "Lu", "lutetium",        175, TRUE,  174.97,    1.87 },
  { "Hf", "hafnium",         180, TRUE,  178.49,    1.75 },
  { "Ta", "tantalum",        181, TRUE,  180.95,    1.70 },
  { "W",  "tungsten",        184, TRUE,  183.84,    1.62 },
  { "Re", "rhenium",         187, TRUE,  186.21,    1.51 },
  { "Os", "osmium",          192, TRUE,  190.23,    1.44 },
  { "Ir", "iridium",         193, TRUE,  192.22,    1.41 },
  { "Pt", "platinum",        195, TRUE,  195.08,    1.36 },
  { "Au", "gold",            197, TRUE,  196.97,    1.36 },
  { "Hg", "mercury",         202, TRUE,  200.59,    1.32 },
  { "Tl", "thallium",        205, TRUE,  204.38,    1.45 },
  { "Pb", "lead",            208, TRUE,  207.2,     1.46 },
  { "Bi", "bismuth",         209, TRUE,  208.98,    1.48 },
  { "Po", "polonium",        209, FALSE,  N,        1.40 },
  { "At", "astatine",        210, FALSE,  N,        1.50 },
  { "Rn", "radon",           222, FALSE,  N,        1.50 },
  { "Fr", "francium",        223, FALSE,  N,        2.60 },
  { "Ra", "radium",          226, FALSE,  N,        2.21 },
  { "Ac", "actinium",        227, FALSE,  N,        2.15 },
  { "Th", "thorium",         232, TRUE,  232.04,    2.06 },
  { "Pa", "protactinium",    231, TRUE,  231.04,    2.00 },
  { "U",  "uranium",         238, TRUE,  238.03,    1.96 },
  { "Np", "neptunium",       237, FALSE,  N,        1.90 },
  { "Pu", "plutonium",       244, FALSE,  N,        1.87 },
  { "Am", "americium",       243, FALSE,  N,        1.80 },
  { "Cm", "curium",          247, FALSE,  N,        1.69 },
  { "Bk", "berkelium",       247, FALSE,  N,        N },
  { "Cf", "californium",     251, FALSE,  N,        N },
  { "Es", "einsteinium",     252, FALSE,  N,        N },
  { "Fm", "fermium",         257, FALSE,  N,        N },
  { "Md", "mendelevium",     258, FALSE,  N,        N },
  { "No", "nobelium",        259, FALSE,  N,        N },
  { "Lr", "lawrencium",      266, FALSE,  N,        N },
  { "Rf", "rutherfordium",   267, FALSE,  N,        N },
  { "Db", "dubnium",         268, FALSE,  N,        N },
  { "Sg", "seaborgium",      269, FALSE,  N,        N },
  { "Bh", "bohrium",         270, FALSE,  N,        N },
  { "Hs", "hassium",         269, FALSE,  N,        N },
  { "Mt", "meitnerium",      278, FALSE,  N,        N },
  { "Ds", "darmstadtium",    281, FALSE,  N,        N },
  { "Rg", "roentgenium",     282, FALSE,  N,        N },
  { "Cn", "copernicium",     285, FALSE,  N,        N },
  { "Nh", "nihonium",        286, FALSE,  N,        N },
  { "Fl", "flerovium",       289, FALSE,  N,        N },
  { "Mc", "moscovium",       290, FALSE,  N,        N },
  { "Lv", "livermorium",     293, FALSE,  N,        N },
  { "Ts", "tennessine",      294, FALSE,  N,        N },
  { "Og", "oganesson",       294, FALSE,  N,        N },
};

#undef N

/* The public element table, filled once from element_rows and isotopes. */
static QvElement elements[QV_ELEMENT_MAX_Z];

static int
isotope_compare (const void *key, const void *member)
{
  const QvIsotope *a = key;
  const QvIsotope *b = member;

  if (a->z != b->z)
    return a->z < b->z ? -1 : 1;
  if (a->mass_number != b->mass_number)
    return a->mass_number < b->mass_number ? -1 : 1;
  return 0;
}

const QvIsotope *
qv_isotope_lookup (guint z, guint mass_number)
{
  QvIsotope key = { .z = z, .mass_number = mass_number };

  return bsearch (&key, isotopes, G_N_ELEMENTS (isotopes), sizeof isotopes[0],
                  isotope_compare);
}

const QvIsotope *
qv_isotope_table (gsize *n_isotopes)
{
  if (n_isotopes != NULL)
    *n_isotopes = G_N_ELEMENTS (isotopes);
  return isotopes;
}

static const QvElement *
element_table (void)
{
  static gsize initialized = 0;

  if (g_once_init_enter (&initialized))
    {
      for (guint i = 0; i < QV_ELEMENT_MAX_Z; i++)
        {
          const ElementRow *row = &element_rows[i];
          const QvIsotope *iso = qv_isotope_lookup (i + 1, row->a);

          elements[i] = (QvElement) {
            .z = i + 1,
            .symbol = row->symbol,
            .name = row->name,
            .mass_number = row->a,
            /* Every reference isotope is in `isotopes`; NAN would show a
               broken table, and tests/element checks it cannot happen. */
            .isotope_mass = iso != NULL ? iso->mass : NAN,
            .stable = row->nat,
            .standard_weight = row->w,
            .covalent_radius = row->r,
          };
        }
      g_once_init_leave (&initialized, 1);
    }
  return elements;
}

const QvElement *
qv_element_from_z (guint z)
{
  if (z < 1 || z > QV_ELEMENT_MAX_Z)
    return NULL;
  return &element_table ()[z - 1];
}

const QvElement *
qv_element_from_symbol (const char *symbol)
{
  const QvElement *table;

  if (symbol == NULL || symbol[0] == '\0')
    return NULL;
  table = element_table ();
  for (guint i = 0; i < QV_ELEMENT_MAX_Z; i++)
    if (g_ascii_strcasecmp (symbol, table[i].symbol) == 0)
      return &table[i];
  return NULL;
}
