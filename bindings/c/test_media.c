/*
 * test_media.c: C tests of the refractive-index functions of include/flatray.h
 * (flatray_index_*, flatray_group_index_*, flatray_sample_*,
 * flatray_material_wavelength_range).
 *
 * Success values: each names its source beside it. Three kinds are used:
 *   - rows of the Rust reference fixtures (tests/data/, made with the iapws and
 *     ref_index Python packages; see tests/data/README.md);
 *   - published formulas re-implemented here from their printed coefficients
 *     (Ciddor 1996 eq. 1, Quan and Fry 1995 eq. 1), independent of the library;
 *   - handbook, hand-computed (mpmath) and common-practice values, as in
 *     tests/reference_media.rs.
 * Error paths: NULL pointers, NaN and +-inf in every argument, finite values
 * outside every range (output must be NaN), unknown material and footing codes.
 */

#include "check.h"

/* ------------------------------------------------------------------------ */
/* Published formulas, written out here independently of the library         */
/* ------------------------------------------------------------------------ */

/* Standard air (dry, 15 C, 101325 Pa, 450 ppm CO2) at a vacuum wavelength:
   Ciddor, Appl. Opt. 35, 1566 (1996), eq. 1, sigma in 1/um. */
static double std_air(double vacuum_nm)
{
    double s2 = (1000.0 / vacuum_nm) * (1000.0 / vacuum_nm);
    return 1.0 + 1e-8 * (5792105.0 / (238.0185 - s2) + 167917.0 / (57.362 - s2));
}

/* The vacuum wavelength whose wavelength in standard air is air_nm (fixed point
   of v = air * n_std(v); the map contracts by ~1e-6 per step). */
static double vacuum_from_air(double air_nm)
{
    double v = air_nm;
    int i;
    for (i = 0; i < 8; i++)
        v = air_nm * std_air(v);
    return v;
}

/* Quan and Fry, Appl. Opt. 34, 3477 (1995), eq. 1: seawater index relative to
   air, T in C, S in PSU, wavelength in air, nm. */
static double quan_fry(double t, double s, double l)
{
    return 1.31405 + (1.779e-4 - 1.05e-6 * t + 1.6e-8 * t * t) * s - 2.02e-6 * t * t
           + (15.868 + 0.01155 * s - 0.00423 * t) / l - 4382.0 / (l * l)
           + 1.1455e6 / (l * l * l);
}

/* Malitson (1965) fused silica, as a user Sellmeier formula. */
static const double SILICA_B[3] = { 0.6961663, 0.4079426, 0.8974794 };
static double silica_c[3]; /* squares of 0.0684043, 0.1162414, 9.896161 um, set in main */

/* ------------------------------------------------------------------------ */
/* Every scalar function as "doubles in, one double out"                      */
/* ------------------------------------------------------------------------ */

typedef FlatrayStatus (*IndexFn)(const double *args, double *out);

static FlatrayStatus pure_water(const double *a, double *o)
{
    return flatray_index_pure_water(a[0], a[1], a[2], o);
}
static FlatrayStatus pure_water_g(const double *a, double *o)
{
    return flatray_group_index_pure_water(a[0], a[1], a[2], o);
}
static FlatrayStatus seawater(const double *a, double *o)
{
    return flatray_index_seawater(a[0], a[1], a[2], o);
}
static FlatrayStatus seawater_g(const double *a, double *o)
{
    return flatray_group_index_seawater(a[0], a[1], a[2], o);
}
static FlatrayStatus seawater_p(const double *a, double *o)
{
    return flatray_index_seawater_at_pressure(a[0], a[1], a[2], a[3], o);
}
static FlatrayStatus seawater_p_g(const double *a, double *o)
{
    return flatray_group_index_seawater_at_pressure(a[0], a[1], a[2], a[3], o);
}
static FlatrayStatus air(const double *a, double *o)
{
    return flatray_index_air(a[0], a[1], a[2], a[3], o);
}
static FlatrayStatus air_g(const double *a, double *o)
{
    return flatray_group_index_air(a[0], a[1], a[2], a[3], o);
}
static FlatrayStatus sapphire(const double *a, double *o)
{
    return flatray_index_material(FLATRAY_MATERIAL_SAPPHIRE_ORDINARY, a[0], o);
}
static FlatrayStatus sapphire_g(const double *a, double *o)
{
    return flatray_group_index_material(FLATRAY_MATERIAL_SAPPHIRE_ORDINARY, a[0], o);
}
static FlatrayStatus pmma(const double *a, double *o)
{
    return flatray_index_material(FLATRAY_MATERIAL_PMMA, a[0], o);
}
static FlatrayStatus pmma_g(const double *a, double *o)
{
    return flatray_group_index_material(FLATRAY_MATERIAL_PMMA, a[0], o);
}
static FlatrayStatus sellmeier(const double *a, double *o)
{
    return flatray_index_sellmeier(SILICA_B, silica_c, a[0], o);
}
static FlatrayStatus sellmeier_g(const double *a, double *o)
{
    return flatray_group_index_sellmeier(SILICA_B, silica_c, a[0], o);
}
static FlatrayStatus cauchy(const double *a, double *o)
{
    return flatray_index_cauchy(a[0], a[1], a[2], a[3], o);
}
static FlatrayStatus cauchy_g(const double *a, double *o)
{
    return flatray_group_index_cauchy(a[0], a[1], a[2], a[3], o);
}
static FlatrayStatus sample_sellmeier_n(const double *a, double *o)
{
    return flatray_sample_sellmeier(SILICA_B, silica_c, FLATRAY_FOOTING_VACUUM, a[0], a[1], a[2],
                                    o, NULL);
}
static FlatrayStatus sample_sellmeier_g(const double *a, double *o)
{
    double n;
    return flatray_sample_sellmeier(SILICA_B, silica_c, FLATRAY_FOOTING_VACUUM, a[0], a[1], a[2],
                                    &n, o);
}
static FlatrayStatus sample_cauchy_n(const double *a, double *o)
{
    return flatray_sample_cauchy(a[0], a[1], a[2], FLATRAY_FOOTING_STANDARD_AIR, a[3], a[4], a[5],
                                 o, NULL);
}
static FlatrayStatus sample_cauchy_g(const double *a, double *o)
{
    double n;
    return flatray_sample_cauchy(a[0], a[1], a[2], FLATRAY_FOOTING_STANDARD_AIR, a[3], a[4], a[5],
                                 &n, o);
}

#define MAX_ARGS 6
#define NONE 1e300 /* "no such out-of-range value" in the tables below */

typedef struct {
    const char *name;
    IndexFn phase, group;
    int nargs;
    int wavelength_arg;
    double ok[MAX_ARGS];
    /* Two finite values of each argument outside the model's validity. */
    double out_of_range[MAX_ARGS][2];
} Model;

/* Ranges: DESIGN of each model in src/media/ (and README "Refractive indices"). */
static const Model MODELS[] = {
    { "pure water", pure_water, pure_water_g, 3, 2, { 20.0, 101325.0, 532.0 },
      { { -1.0, 351.0 },               /* 0-350 C (IF97 region 1) */
        { 1000.0, 100.1e6 },           /* below boiling at 20 C; above 100 MPa */
        { 199.0, 1101.0 } } },         /* 200-1100 nm (R9-97) */
    { "seawater", seawater, seawater_g, 3, 2, { 4.0, 35.0, 532.0 },
      { { -0.5, 30.5 },                /* 0-30 C (Quan-Fry data) */
        { -1.0, 35.5 },                /* 0-35 PSU */
        { 399.0, 701.0 } } },          /* 400-700 nm */
    { "seawater at pressure", seawater_p, seawater_p_g, 4, 3, { 4.0, 35.0, 20e6, 532.0 },
      { { -0.5, 30.5 }, { -1.0, 35.5 },
        { -1.0, 101e6 },               /* p_s(T) to 100 MPa */
        { 0.0, 800.0 } } },
    { "air", air, air_g, 4, 3, { 20.0, 101325.0, 0.5, 633.0 },
      { { -41.0, 101.0 },              /* -40 to 100 C (Ciddor range, NIST) */
        { 9e3, 141e3 },                /* 10-140 kPa */
        { -0.01, 1.01 },               /* relative humidity 0-1 */
        { 299.0, 1701.0 } } },         /* 300-1700 nm */
    { "sapphire", sapphire, sapphire_g, 1, 0, { 532.0 }, { { 199.0, 5001.0 } } },
    { "PMMA", pmma, pmma_g, 1, 0, { 532.0 }, { { 399.0, 1061.0 } } },
    { "user Sellmeier", sellmeier, sellmeier_g, 1, 0, { 532.0 },
      { { 199.0, -532.0 } } },         /* 200 nm and up on the standard-air footing */
    { "user Cauchy", cauchy, cauchy_g, 4, 3, { 1.5, 0.004, 1e-4, 532.0 },
      { { -2.0, NONE },                /* n < 0 */
        { -1.0, NONE },                /* 1.5 - 1/0.28 < 0 */
        { -1.0, NONE },
        { 150.0, 0.0 } } },
    { "flatray_sample_sellmeier", sample_sellmeier_n, sample_sellmeier_g, 3, 2,
      { 210.0, 3710.0, 532.0 },
      { { NONE, NONE }, { NONE, NONE }, { 209.0, 3711.0 } } },
    { "flatray_sample_cauchy", sample_cauchy_n, sample_cauchy_g, 6, 5,
      { 1.5, 0.004, 1e-4, 400.0, 700.0, 532.0 },
      { { -2.0, NONE }, { NONE, NONE }, { NONE, NONE }, { NONE, NONE }, { NONE, NONE },
        { 399.0, 701.0 } } },
};
#define MODEL_COUNT (sizeof MODELS / sizeof MODELS[0])

static void copy_args(double *dst, const Model *m)
{
    memcpy(dst, m->ok, sizeof m->ok);
}

/* Every model: success, NULL out, NaN/inf in each argument, finite values out of
   range, for the phase and the group function. */
static void test_error_paths(void)
{
    size_t k;
    for (k = 0; k < MODEL_COUNT; k++) {
        const Model *m = &MODELS[k];
        IndexFn fns[2];
        int f;
        fns[0] = m->phase;
        fns[1] = m->group;
        for (f = 0; f < 2; f++) {
            double args[MAX_ARGS], out;
            int i, p;
            const char *kind = f ? "group" : "phase";

            set_context("%s (%s): valid arguments", m->name, kind);
            copy_args(args, m);
            out = SENTINEL;
            CHECK_STATUS(fns[f](args, &out), FLATRAY_OK);
            CHECK(out > 1.0 && out < 2.0);

            set_context("%s (%s): NULL out", m->name, kind);
            if (f == 1 && (m->phase == sample_sellmeier_n || m->phase == sample_cauchy_n))
                CHECK_STATUS(fns[f](args, NULL), FLATRAY_OK); /* out_group_n is optional */
            else
                CHECK_STATUS(fns[f](args, NULL), FLATRAY_ERR_NULL_POINTER);

            for (i = 0; i < m->nargs; i++) {
                for (p = 0; p < POISON_COUNT; p++) {
                    set_context("%s (%s): argument %d = %s", m->name, kind, i, POISON_NAME[p]);
                    copy_args(args, m);
                    args[i] = poison(p);
                    if (i == 4 && m->phase == sample_cauchy_n && p == 1)
                        continue; /* max_wavelength_nm = +inf means "no upper limit" */
                    if (i == 1 && m->phase == sample_sellmeier_n && p == 1)
                        continue;
                    out = SENTINEL;
                    CHECK_STATUS(fns[f](args, &out), FLATRAY_ERR_INVALID_ARGUMENT);
                    CHECK_NAN(out);
                }
                /* A NaN next to a finite out-of-range value is still invalid:
                   non-finite arguments are checked before any range. */
                for (p = 0; p < m->nargs; p++) {
                    if (p == i || m->out_of_range[p][0] == NONE)
                        continue;
                    set_context("%s (%s): argument %d = NaN, argument %d = %g", m->name, kind, i,
                                p, m->out_of_range[p][0]);
                    copy_args(args, m);
                    args[i] = NAN;
                    args[p] = m->out_of_range[p][0];
                    out = SENTINEL;
                    CHECK_STATUS(fns[f](args, &out), FLATRAY_ERR_INVALID_ARGUMENT);
                    CHECK_NAN(out);
                }
                for (p = 0; p < 2; p++) {
                    double bad = m->out_of_range[i][p];
                    if (bad == NONE)
                        continue;
                    set_context("%s (%s): argument %d = %g (out of range)", m->name, kind, i, bad);
                    copy_args(args, m);
                    args[i] = bad;
                    out = SENTINEL;
                    CHECK_STATUS(fns[f](args, &out), FLATRAY_ERR_OUT_OF_RANGE);
                    CHECK_NAN(out);
                }
            }
        }
    }
    clear_context();
}

/* Group index against a central difference of the phase index, step 0.01 nm.
   Error budget (src/media/mod.rs, testutil): truncation h^2 |n'''| / 6 and
   rounding eps n / h are both below 1e-13 per nm at these wavelengths, i.e.
   below 1e-10 in lambda dn/dlambda; tolerance 1e-8. */
static void test_group_indices_by_difference(void)
{
    size_t k;
    for (k = 0; k < MODEL_COUNT; k++) {
        const Model *m = &MODELS[k];
        double args[MAX_ARGS], up, down, n, ng;
        double l = m->ok[m->wavelength_arg], h = 0.01;
        set_context("%s: group index by difference", m->name);
        copy_args(args, m);
        CHECK_STATUS(m->phase(args, &n), FLATRAY_OK);
        CHECK_STATUS(m->group(args, &ng), FLATRAY_OK);
        args[m->wavelength_arg] = l + h;
        CHECK_STATUS(m->phase(args, &up), FLATRAY_OK);
        args[m->wavelength_arg] = l - h;
        CHECK_STATUS(m->phase(args, &down), FLATRAY_OK);
        CHECK_NEAR(ng, n - l * (up - down) / (2.0 * h), 1e-8);
        /* Every medium here is normally dispersive in the visible: n_g > n. */
        CHECK(ng > n);
    }
    clear_context();
}

/* ------------------------------------------------------------------------ */
/* Values                                                                     */
/* ------------------------------------------------------------------------ */

static void test_pure_water_values(void)
{
    /* Rows of tests/data/iapws_reference.csv, made with the iapws package 1.5.5
       (make_iapws_reference.py): T C, p Pa, vacuum nm, R9-97 at the IF97
       density, R9-97 at the IAPWS-95 density. */
    static const double rows[][5] = {
        { 0.0, 101325.0, 250.0, 1.3788560168942303, 1.3788555505623485 },
        { 4.0, 101325.0, 532.0, 1.3363291626366287, 1.336328985649031 },
        { 25.0, 101325.0, 1000.0, 1.3249846246572339, 1.3249844995870077 },
        { 40.0, 10000000.0, 700.0, 1.3295371693162272, 1.3295378756896614 },
        { 60.0, 50000000.0, 404.7, 1.344077951712287, 1.3440777900071978 },
        { 4.0, 100000000.0, 532.0, 1.3508435526431073, 1.3508485399948722 },
    };
    size_t i;
    double n, ng;
    for (i = 0; i < sizeof rows / sizeof rows[0]; i++) {
        set_context("pure water %g C, %g Pa, %g nm", rows[i][0], rows[i][1], rows[i][2]);
        CHECK_STATUS(flatray_index_pure_water(rows[i][0], rows[i][1], rows[i][2], &n), FLATRAY_OK);
        /* Same formulation and density (IF97 region 1 agrees with iapws to 1e-12
           relative; dn/drho * rho ~ 0.34): tolerance 1e-11. */
        CHECK_NEAR(n, rows[i][3], 1e-11);
        /* R9-97 as IAPWS defines it, at the IAPWS-95 density: IF97 densities
           differ by up to 1.8e-5 relative, ~7e-6 in n; the bound 1e-5. */
        CHECK_NEAR(n, rows[i][4], 1e-5);
    }
    /* Handbook (common practice, from memory): 20 C, sodium D line 589.3 nm,
       n = 1.33335 absolute (1.3330 relative to air); tolerance 2e-5 as in
       tests/reference_media.rs. */
    set_context("pure water, handbook value");
    CHECK_STATUS(flatray_index_pure_water(20.0, 101325.0, 589.3, &n), FLATRAY_OK);
    CHECK_NEAR(n, 1.33335, 2e-5);
    CHECK_NEAR(n / std_air(589.3), 1.3330, 5e-5);
    /* Common practice: the group index of water near 532 nm is about 1.357
       (n ~ 1.335 plus lambda |dn/dlambda| ~ 0.02); +-0.01. */
    CHECK_STATUS(flatray_group_index_pure_water(20.0, 101325.0, 532.0, &ng), FLATRAY_OK);
    CHECK_NEAR(ng, 1.357, 0.01);
    clear_context();
}

static void test_water_at_density(void)
{
    /* R9-97 check values, as quoted in the docstring of _Refractive in the
       iapws package 1.5.5 (citing the release): half a unit in the 8th
       decimal. */
    static const double ok[][4] = {
        { 25.0, 997.047435, 226.5, 1.39277824 },
        { 500.0, 30.4758534, 589.3, 1.00949307 },
    };
    /* Finite values outside -12..500 C, 0..1060 kg/m3, 200..1100 nm. */
    static const double out_of_range[3][2] = { { -12.5, 500.5 }, { -1.0, 1060.5 }, { 199.0, 1101.0 } };
    double args[3], n;
    size_t i;
    int k, p;
    for (i = 0; i < 2; i++) {
        set_context("water at density, row %d", (int)i);
        CHECK_STATUS(flatray_index_water_at_density(ok[i][0], ok[i][1], ok[i][2], &n), FLATRAY_OK);
        CHECK_NEAR(n, ok[i][3], 5e-9);
    }
    /* Supercooled water is inside R9-97 when the density is given. */
    CHECK_STATUS(flatray_index_water_at_density(-10.0, 998.1, 532.0, &n), FLATRAY_OK);
    CHECK_STATUS(flatray_index_water_at_density(20.0, 998.2, 532.0, NULL), FLATRAY_ERR_NULL_POINTER);
    for (k = 0; k < 3; k++) {
        for (p = 0; p < POISON_COUNT + 2; p++) {
            args[0] = 20.0;
            args[1] = 998.2;
            args[2] = 532.0;
            args[k] = p < POISON_COUNT ? poison(p) : out_of_range[k][p - POISON_COUNT];
            set_context("water at density, argument %d = %g", k, args[k]);
            n = SENTINEL;
            CHECK_STATUS(flatray_index_water_at_density(args[0], args[1], args[2], &n),
                         p < POISON_COUNT ? FLATRAY_ERR_INVALID_ARGUMENT : FLATRAY_ERR_OUT_OF_RANGE);
            CHECK_NAN(n);
        }
    }
    clear_context();
}

static void test_seawater_values(void)
{
    /* The test's own Quan-Fry, checked against the hand value of
       tests/reference_media.rs (mpmath from the published coefficients):
       T = 20, S = 0, 589.3 nm in air -> 1.33300443427695; tolerance 1e-9. */
    static const double cases[][3] = {
        { 4.0, 35.0, 532.0 }, { 20.0, 0.0, 589.3 }, { 30.0, 35.0, 700.0 },
        { 0.0, 35.0, 400.0 }, { 12.5, 17.0, 450.0 },
    };
    size_t i;
    double n, n0, n35, deep, w_deep, w_surf;
    CHECK_NEAR(quan_fry(20.0, 0.0, 589.3), 1.33300443427695, 1e-9);
    for (i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        double t = cases[i][0], s = cases[i][1], l = cases[i][2];
        double a = std_air(l);
        set_context("seawater %g C, %g PSU, %g nm", t, s, l);
        /* Footing: absolute index at the vacuum wavelength = n_std(l) times
           Quan-Fry at the standard-air wavelength l / n_std(l). Same closed
           forms evaluated twice in double precision: tolerance 1e-12. */
        CHECK_STATUS(flatray_index_seawater(t, s, l, &n), FLATRAY_OK);
        CHECK_NEAR(n, a * quan_fry(t, s, l / a), 1e-12);
        /* At exactly one atmosphere the pressure form is the surface form. */
        CHECK_STATUS(flatray_index_seawater_at_pressure(t, s, FLATRAY_STANDARD_PRESSURE_PA, l, &deep),
                     FLATRAY_OK);
        CHECK(deep == n);
    }
    /* Common practice: 35 PSU seawater is ~0.0064 above fresh water at 20 C in
       the visible; +-0.0002 (tests/reference_media.rs). */
    set_context("salinity offset");
    CHECK_STATUS(flatray_index_seawater(20.0, 0.0, 589.3, &n0), FLATRAY_OK);
    CHECK_STATUS(flatray_index_seawater(20.0, 35.0, 589.3, &n35), FLATRAY_OK);
    CHECK_NEAR(n35 - n0, 0.0064, 0.0002);
    /* The pressure term is the pure-water difference (the documented recipe
       for C callers), with the same arithmetic: equal to one rounding unit. */
    set_context("seawater pressure term");
    CHECK_STATUS(flatray_index_seawater(4.0, 35.0, 532.0, &n), FLATRAY_OK);
    CHECK_STATUS(flatray_index_seawater_at_pressure(4.0, 35.0, 101325.0 + 20e6, 532.0, &deep),
                 FLATRAY_OK);
    CHECK_STATUS(flatray_index_pure_water(4.0, 101325.0 + 20e6, 532.0, &w_deep), FLATRAY_OK);
    CHECK_STATUS(flatray_index_pure_water(4.0, 101325.0, 532.0, &w_surf), FLATRAY_OK);
    CHECK_NEAR(deep, n + (w_deep - w_surf), 2.3e-16 * 1.35);
    /* IAPWS R9-97 with IF97: about 1.5e-4 per MPa near the surface, so
       20 MPa adds 2.5e-3 to 3.5e-3 (tests in src/media/seawater.rs). */
    CHECK(deep - n > 2.5e-3 && deep - n < 3.5e-3);
    clear_context();
}

static void test_air_values(void)
{
    /* Rows of tests/data/air_reference.csv, made with the ref_index package 1.0
       (Ciddor 1996 as documented by NIST), 450 ppm CO2: T C, p Pa, RH, vacuum nm,
       n. Tolerance 2e-9, as in tests/reference_media.rs (the package uses the
       IAPWS vapour pressure where Ciddor uses the BIPM formula). */
    static const double rows[][5] = {
        { 10.0, 60000.0, 0.0, 1550.0, 1.0001646475700439 },
        { 20.0, 101325.0, 0.5, 633.0, 1.0002713727468782 },
        { 30.0, 101325.0, 1.0, 1064.0, 1.0002588729571236 },
        { 40.0, 120000.0, 1.0, 350.0, 1.0003094155856807 },
    };
    size_t i;
    double n, ng;
    for (i = 0; i < sizeof rows / sizeof rows[0]; i++) {
        set_context("air %g C, %g Pa, RH %g, %g nm", rows[i][0], rows[i][1], rows[i][2],
                    rows[i][3]);
        CHECK_STATUS(flatray_index_air(rows[i][0], rows[i][1], rows[i][2], rows[i][3], &n),
                     FLATRAY_OK);
        CHECK_NEAR(n, rows[i][4], 2e-9);
    }
    /* Standard air reduces to Ciddor eq. 1 (the test's own evaluation; same
       closed form, tolerance 1e-14), and 10^8 (n - 1) at 532 nm is
       27820.83179 (mpmath from the published constants; tolerance 1e-12). */
    set_context("standard air");
    CHECK_STATUS(flatray_index_air(15.0, 101325.0, 0.0, 532.0, &n), FLATRAY_OK);
    CHECK_NEAR(n, std_air(532.0), 1e-14);
    CHECK_NEAR(n - 1.0, 2.782083179e-4, 1e-12);
    /* Common practice: the group refractivity of air in the visible is a few
       percent above the phase refractivity (Ciddor eq. 1: ~3 % at 633 nm). */
    CHECK_STATUS(flatray_group_index_air(15.0, 101325.0, 0.0, 633.0, &ng), FLATRAY_OK);
    CHECK_STATUS(flatray_index_air(15.0, 101325.0, 0.0, 633.0, &n), FLATRAY_OK);
    CHECK((ng - 1.0) / (n - 1.0) > 1.01 && (ng - 1.0) / (n - 1.0) < 1.05);
    clear_context();
}

/* A material's index as its source gives it: relative to air at the
   wavelength in air, from flatray's absolute value at the matching vacuum
   wavelength. */
static double relative_at_air_wavelength(int32_t material, double air_nm)
{
    double v = vacuum_from_air(air_nm), n = SENTINEL;
    CHECK_STATUS(flatray_index_material(material, v, &n), FLATRAY_OK);
    return n / std_air(v);
}

static void test_material_values(void)
{
    /* Fraunhofer d, F, C lines in air, nm (common practice). */
    static const double lines[3] = { 587.5618, 486.1327, 656.2725 };
    /* Fused silica: Malitson (1965) measured n_d, n_F, n_C; tolerance half a
       unit in the 5th decimal (tests/reference_media.rs). */
    static const double silica[3] = { 1.45846, 1.46313, 1.45637 };
    /* Sapphire (ordinary) and soda-lime glass: the published formulas
       evaluated by hand with mpmath (tests/reference_media.rs); the conversion
       back to the source's footing here is exact to ~1e-15; tolerance 1e-9. */
    static const double sapphire_o[3] = { 1.768172093, 1.77550751, 1.764883985 };
    static const double soda_lime[3] = { 1.523382414, 1.529016134, 1.520834247 };
    static const struct {
        int32_t code;
        double lo, hi;
    } ranges[] = {
        /* The sources' ranges, as src/media/materials.rs states them. */
        { FLATRAY_MATERIAL_FUSED_SILICA, 210.0, 3710.0 },
        { FLATRAY_MATERIAL_SAPPHIRE_ORDINARY, 200.0, 5000.0 },
        { FLATRAY_MATERIAL_PMMA, 400.0, 1060.0 },
        { FLATRAY_MATERIAL_POLYCARBONATE, 400.0, 1060.0 },
        { FLATRAY_MATERIAL_SODA_LIME_GLASS, 320.0, 4600.0 },
    };
    static const int32_t bad_codes[] = { -1, 5, 99, INT32_MIN, INT32_MAX };
    int i;
    size_t k;
    double lo, hi, n, ng;

    for (i = 0; i < 3; i++) {
        set_context("material lines, %g nm in air", lines[i]);
        CHECK_NEAR(relative_at_air_wavelength(FLATRAY_MATERIAL_FUSED_SILICA, lines[i]), silica[i],
                   5e-6);
        CHECK_NEAR(relative_at_air_wavelength(FLATRAY_MATERIAL_SAPPHIRE_ORDINARY, lines[i]),
                   sapphire_o[i], 1e-9);
        CHECK_NEAR(relative_at_air_wavelength(FLATRAY_MATERIAL_SODA_LIME_GLASS, lines[i]),
                   soda_lime[i], 1e-9);
    }
    /* PMMA and polycarbonate at the d line: measured 1.491 and 1.585
       (Sultanova, Kasarova and Nikolov 2009, +-0.001, printed to 3 decimals):
       tolerance 0.0015. */
    set_context("polymers at the d line");
    CHECK_NEAR(relative_at_air_wavelength(FLATRAY_MATERIAL_PMMA, lines[0]), 1.491, 0.0015);
    CHECK_NEAR(relative_at_air_wavelength(FLATRAY_MATERIAL_POLYCARBONATE, lines[0]), 1.585, 0.0015);

    for (k = 0; k < sizeof ranges / sizeof ranges[0]; k++) {
        set_context("material %d range", (int)ranges[k].code);
        lo = hi = SENTINEL;
        CHECK_STATUS(flatray_material_wavelength_range(ranges[k].code, &lo, &hi), FLATRAY_OK);
        CHECK(lo == ranges[k].lo && hi == ranges[k].hi);
        /* The ends are inside, a step past them is not. */
        CHECK_STATUS(flatray_index_material(ranges[k].code, lo, &n), FLATRAY_OK);
        CHECK_STATUS(flatray_index_material(ranges[k].code, hi, &n), FLATRAY_OK);
        n = SENTINEL;
        CHECK_STATUS(flatray_index_material(ranges[k].code, lo - 0.5, &n), FLATRAY_ERR_OUT_OF_RANGE);
        CHECK_NAN(n);
        ng = SENTINEL;
        CHECK_STATUS(flatray_group_index_material(ranges[k].code, hi + 0.5, &ng),
                     FLATRAY_ERR_OUT_OF_RANGE);
        CHECK_NAN(ng);
        CHECK_STATUS(flatray_index_material(ranges[k].code, NAN, &n), FLATRAY_ERR_INVALID_ARGUMENT);
        /* Glasses and polymers have n_g > n in the visible. */
        CHECK_STATUS(flatray_index_material(ranges[k].code, 532.0, &n), FLATRAY_OK);
        CHECK_STATUS(flatray_group_index_material(ranges[k].code, 532.0, &ng), FLATRAY_OK);
        CHECK(ng > n && n > 1.4 && n < 1.8);
    }
    for (k = 0; k < sizeof bad_codes / sizeof bad_codes[0]; k++) {
        set_context("unknown material code %ld", (long)bad_codes[k]);
        n = ng = lo = hi = SENTINEL;
        CHECK_STATUS(flatray_index_material(bad_codes[k], 532.0, &n), FLATRAY_ERR_INVALID_ARGUMENT);
        CHECK_NAN(n);
        CHECK_STATUS(flatray_group_index_material(bad_codes[k], 532.0, &ng),
                     FLATRAY_ERR_INVALID_ARGUMENT);
        CHECK_NAN(ng);
        CHECK_STATUS(flatray_material_wavelength_range(bad_codes[k], &lo, &hi),
                     FLATRAY_ERR_INVALID_ARGUMENT);
        CHECK_NAN(lo);
        CHECK_NAN(hi);
    }
    set_context("material: NULL outputs");
    CHECK_STATUS(flatray_index_material(0, 532.0, NULL), FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_group_index_material(0, 532.0, NULL), FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_index_material(99, 532.0, NULL), FLATRAY_ERR_NULL_POINTER);
    lo = hi = SENTINEL;
    CHECK_STATUS(flatray_material_wavelength_range(0, NULL, &hi), FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(hi);
    CHECK_STATUS(flatray_material_wavelength_range(0, &lo, NULL), FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(lo);
    CHECK_STATUS(flatray_material_wavelength_range(0, NULL, NULL), FLATRAY_ERR_NULL_POINTER);
    clear_context();
}

static void test_user_formulas(void)
{
    double n, ng, want, la, silica_n, silica_ng, b_bad[3], c_bad[3];
    int i, p;

    /* The catalogue footing: Malitson's formula given as a user Sellmeier
       formula is flatray's fused silica, to the last bit (same arithmetic). */
    set_context("user Sellmeier = built-in fused silica");
    CHECK_STATUS(flatray_index_sellmeier(SILICA_B, silica_c, 532.0, &n), FLATRAY_OK);
    CHECK_STATUS(flatray_index_material(FLATRAY_MATERIAL_FUSED_SILICA, 532.0, &silica_n), FLATRAY_OK);
    CHECK(n == silica_n);
    CHECK_STATUS(flatray_group_index_sellmeier(SILICA_B, silica_c, 532.0, &ng), FLATRAY_OK);
    CHECK_STATUS(flatray_group_index_material(FLATRAY_MATERIAL_FUSED_SILICA, 532.0, &silica_ng),
                 FLATRAY_OK);
    CHECK(ng == silica_ng);
    /* flatray_sample_sellmeier with the standard-air footing and no range is
       flatray_index_sellmeier. */
    CHECK_STATUS(flatray_sample_sellmeier(SILICA_B, silica_c, FLATRAY_FOOTING_STANDARD_AIR, 0.0,
                                          INFINITY, 532.0, &want, &ng),
                 FLATRAY_OK);
    CHECK(want == n && ng == silica_ng);
    /* Vacuum footing: the formula itself. Malitson at 587.5618 nm evaluated by
       hand with mpmath, 1.458463687 (src/media/dispersion.rs); tolerance 1e-9. */
    set_context("user Sellmeier, vacuum footing");
    CHECK_STATUS(flatray_sample_sellmeier(SILICA_B, silica_c, FLATRAY_FOOTING_VACUUM, 210.0, 3710.0,
                                          587.5618, &n, NULL),
                 FLATRAY_OK);
    CHECK_NEAR(n, 1.458463687, 1e-9);

    /* Cauchy by hand: a = 1.5, b = 0.004 um^2, c = 1e-4 um^4 at 0.5 um:
       1.5 + 0.016 + 0.0016 = 1.5176 (vacuum footing; tolerance 1e-14). */
    set_context("user Cauchy");
    CHECK_STATUS(flatray_sample_cauchy(1.5, 0.004, 1e-4, FLATRAY_FOOTING_VACUUM, 0.0, INFINITY, 500.0,
                                       &n, &ng),
                 FLATRAY_OK);
    CHECK_NEAR(n, 1.5176, 1e-14);
    /* Group index of that formula by hand: n - l dn/dl = a + 3b/l^2 + 5c/l^4
       = 1.5 + 0.048 + 0.008 = 1.556. */
    CHECK_NEAR(ng, 1.556, 1e-14);
    /* The C function's catalogue footing: n_std(l) times the formula at the
       standard-air wavelength, written out here (tolerance 1e-14). */
    CHECK_STATUS(flatray_index_cauchy(1.5, 0.004, 1e-4, 500.0, &n), FLATRAY_OK);
    la = 0.5 / std_air(500.0);
    want = std_air(500.0) * (1.5 + 0.004 / (la * la) + 1e-4 / (la * la * la * la));
    CHECK_NEAR(n, want, 1e-14);

    /* A resonance: b = (1, 0, 0), c = (0.1^2, 0, 0) um^2 has a pole at 100 nm
       (exactly, in floating point: 100 nm is 0.1 um squared the same way) and
       n^2 < 0 just above it; the vacuum footing reaches it. */
    set_context("user Sellmeier at a resonance");
    {
        static const double b1[3] = { 1.0, 0.0, 0.0 };
        double c1[3];
        c1[0] = 0.1 * 0.1;
        c1[1] = c1[2] = 0.0;
        n = SENTINEL;
        CHECK_STATUS(flatray_sample_sellmeier(b1, c1, FLATRAY_FOOTING_VACUUM, 0.0, INFINITY, 100.0,
                                              &n, NULL),
                     FLATRAY_ERR_OUT_OF_RANGE);
        CHECK_NAN(n);
        CHECK_STATUS(flatray_sample_sellmeier(b1, c1, FLATRAY_FOOTING_VACUUM, 0.0, INFINITY, 95.0,
                                              &n, NULL),
                     FLATRAY_ERR_OUT_OF_RANGE);
        /* The catalogue footing stops at 200 nm. */
        CHECK_STATUS(flatray_index_sellmeier(b1, c1, 190.0, &n), FLATRAY_ERR_OUT_OF_RANGE);
        CHECK_STATUS(flatray_index_sellmeier(b1, c1, 200.0, &n), FLATRAY_OK);
    }

    /* NaN and inf in each coefficient; NULL coefficient pointers. */
    for (i = 0; i < 3; i++) {
        for (p = 0; p < POISON_COUNT; p++) {
            set_context("Sellmeier coefficient %d = %s", i, POISON_NAME[p]);
            memcpy(b_bad, SILICA_B, sizeof b_bad);
            memcpy(c_bad, silica_c, sizeof c_bad);
            b_bad[i] = poison(p);
            n = SENTINEL;
            CHECK_STATUS(flatray_index_sellmeier(b_bad, silica_c, 532.0, &n),
                         FLATRAY_ERR_INVALID_ARGUMENT);
            CHECK_NAN(n);
            c_bad[i] = poison(p);
            n = SENTINEL;
            CHECK_STATUS(flatray_group_index_sellmeier(SILICA_B, c_bad, 532.0, &n),
                         FLATRAY_ERR_INVALID_ARGUMENT);
            CHECK_NAN(n);
            n = ng = SENTINEL;
            CHECK_STATUS(flatray_sample_sellmeier(b_bad, silica_c, FLATRAY_FOOTING_VACUUM, 0.0,
                                                  INFINITY, 532.0, &n, &ng),
                         FLATRAY_ERR_INVALID_ARGUMENT);
            CHECK_NAN(n);
            CHECK_NAN(ng);
        }
    }
    set_context("Sellmeier NULL pointers");
    n = SENTINEL;
    CHECK_STATUS(flatray_index_sellmeier(NULL, silica_c, 532.0, &n), FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(n);
    n = SENTINEL;
    CHECK_STATUS(flatray_index_sellmeier(SILICA_B, NULL, 532.0, &n), FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(n);
    n = SENTINEL;
    CHECK_STATUS(flatray_group_index_sellmeier(NULL, NULL, 532.0, &n), FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(n);
    CHECK_STATUS(flatray_index_sellmeier(NULL, NULL, 532.0, NULL), FLATRAY_ERR_NULL_POINTER);
    n = ng = SENTINEL;
    CHECK_STATUS(flatray_sample_sellmeier(NULL, silica_c, 1, 0.0, INFINITY, 532.0, &n, &ng),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(n);
    CHECK_NAN(ng);
    /* A NULL out_n is an error even when the group output is wanted. */
    ng = SENTINEL;
    CHECK_STATUS(flatray_sample_sellmeier(SILICA_B, silica_c, 1, 0.0, INFINITY, 532.0, NULL, &ng),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(ng);
    ng = SENTINEL;
    CHECK_STATUS(flatray_sample_cauchy(1.5, 0.0, 0.0, 1, 0.0, INFINITY, 532.0, NULL, &ng),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(ng);

    /* Footing codes and malformed ranges. */
    {
        static const int32_t bad_footing[] = { -1, 2, INT32_MAX, INT32_MIN };
        static const double bad_ranges[][2] = {
            { 800.0, 400.0 }, /* min > max */
            { -1.0, 700.0 },  /* min < 0 */
            { INFINITY, INFINITY },
            { 400.0, NAN },
        };
        size_t k;
        for (k = 0; k < sizeof bad_footing / sizeof bad_footing[0]; k++) {
            set_context("footing code %ld", (long)bad_footing[k]);
            n = ng = SENTINEL;
            CHECK_STATUS(flatray_sample_sellmeier(SILICA_B, silica_c, bad_footing[k], 0.0, INFINITY,
                                                  532.0, &n, &ng),
                         FLATRAY_ERR_INVALID_ARGUMENT);
            CHECK_NAN(n);
            CHECK_NAN(ng);
            n = SENTINEL;
            CHECK_STATUS(flatray_sample_cauchy(1.5, 0.0, 0.0, bad_footing[k], 0.0, INFINITY, 532.0,
                                               &n, NULL),
                         FLATRAY_ERR_INVALID_ARGUMENT);
            CHECK_NAN(n);
        }
        for (k = 0; k < sizeof bad_ranges / sizeof bad_ranges[0]; k++) {
            set_context("wavelength range %g..%g", bad_ranges[k][0], bad_ranges[k][1]);
            n = SENTINEL;
            CHECK_STATUS(flatray_sample_cauchy(1.5, 0.0, 0.0, 0, bad_ranges[k][0], bad_ranges[k][1],
                                               532.0, &n, NULL),
                         FLATRAY_ERR_INVALID_ARGUMENT);
            CHECK_NAN(n);
        }
    }
    clear_context();
}

/* The recipe the header gives C callers for seawater at depth, and the stack a
   camera housing needs: every index of "camera in air at 1 atm, 8 mm sapphire
   port, seawater at 4 C and 35 PSU, 532 nm" goes into a FlatrayStack. */
static void test_stack_from_media(void)
{
    FlatrayStack s;
    FlatrayVec3 seen;
    set_context("stack from media");
    memset(&s, 0, sizeof s);
    s.origin = v3(0.0, 0.0, 0.05);
    s.normal = v3(0.0, 0.0, 1.0);
    s.layer_count = 1;
    s.thickness[0] = 0.008;
    CHECK_STATUS(flatray_index_air(20.0, FLATRAY_STANDARD_PRESSURE_PA, 0.5, 532.0, &s.n_observer),
                 FLATRAY_OK);
    CHECK_STATUS(flatray_index_material(FLATRAY_MATERIAL_SAPPHIRE_ORDINARY, 532.0, &s.n_layer[0]),
                 FLATRAY_OK);
    CHECK_STATUS(flatray_index_seawater(4.0, 35.0, 532.0, &s.n_object), FLATRAY_OK);
    /* Sapphire > seawater > air. */
    CHECK(s.n_layer[0] > s.n_object && s.n_object > s.n_observer);
    CHECK_STATUS(flatray_apparent_position(&s, v3(0, 0, 0), v3(0.2, 0.0, 1.5),
                                           FLATRAY_IMAGE_SAGITTAL, &seen),
                 FLATRAY_OK);
    /* Behind a flat port things look closer (common practice). */
    CHECK(seen.z < 1.5 && seen.z > 1.0);
    clear_context();
}

int main(void)
{
    silica_c[0] = 0.0684043 * 0.0684043;
    silica_c[1] = 0.1162414 * 0.1162414;
    silica_c[2] = 9.896161 * 9.896161;
    test_error_paths();
    test_group_indices_by_difference();
    test_pure_water_values();
    test_water_at_density();
    test_seawater_values();
    test_air_values();
    test_material_values();
    test_user_formulas();
    test_stack_from_media();
    return check_summary();
}
