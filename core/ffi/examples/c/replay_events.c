/*
 * Replays the firmware example's invented short night through the Standfast
 * guard over the C ABI and prints the guard's event lines, in the format of
 * `standfast replay --events` (core/ffi/ci.sh compares the two with diff):
 *
 *   event t_ms=<u64> kind=fault sensor=<sensor> class=<class>
 *   event t_ms=<u64> kind=events_lost count=<n>
 *   event t_ms=<u64> kind=level from=<level> to=<level>
 *
 * Usage: replay_events RIG_IMAGE ACCEL_LOG GUARD_INPUTS
 *   RIG_IMAGE     written by `standfast rig-image firmware-example/replay/rig.toml --out FILE`
 *   ACCEL_LOG     firmware-example/replay/short-night.csv (t_ms, accel_x/y/z raw words)
 *   GUARD_INPUTS  firmware-example/replay/short-night-host.csv (t_ms, wind_mps,
 *                 wind_from_rad, ha_rad, dec_rad)
 *
 * The two logs are merged by time as host-sim merges them: one guard step
 * per distinct time stamp, carrying only the values present at that time;
 * times are milliseconds since the first record.
 *
 * Accelerometer: the LIS3DH's left-justified 12-bit words at +/-2 g, as the
 * firmware's driver converts them: (float)(word >> 4) * 0.001f g (rig frame;
 * the example rig's mounting is the identity, scale 1.0).
 *
 * C99 and C++17 (no designated initialisers, no VLAs); hosted or newlib.
 * Exit status: 0 done, 1 usage or file error, 2 library error, 3 bad log.
 */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "standfast.h"

#define MAX_LINE 256
#define MAX_FIELDS 16

/* Guard storage: the union gives it 8-byte alignment in C99 (checked
 * against sf_guard_storage_align() at run time, and by the library). */
static union {
    uint64_t align_u64;
    double align_double;
    uint8_t bytes[SF_GUARD_STORAGE_SIZE];
} storage;

static uint8_t image[SF_RIG_IMAGE_MAX_BYTES];

/* One CSV file read row by row, with its column positions. */
typedef struct {
    FILE *f;
    const char *path;
    unsigned long line_no;
    int col[MAX_FIELDS];       /* index of each wanted column, -1 if absent */
    int has_row;               /* a row is buffered */
    unsigned long long t_ms;   /* its time */
    char *fields[MAX_FIELDS];  /* its fields (point into buf) */
    int n_fields;
    char buf[MAX_LINE];
} Csv;

static int split(char *line, char **fields) {
    int n = 0;
    char *p = line;
    size_t len = strlen(line);
    while (len > 0 && (line[len - 1] == '\n' || line[len - 1] == '\r')) {
        line[--len] = '\0';
    }
    fields[n++] = p;
    for (; *p != '\0'; p++) {
        if (*p == ',') {
            *p = '\0';
            if (n == MAX_FIELDS) {
                return -1;
            }
            fields[n++] = p + 1;
        }
    }
    return n;
}

/* Reads the next data line (skipping '#' comments and blank lines) into
 * c->buf and splits it; 1 read, 0 end of file, -1 error. */
static int next_line(Csv *c) {
    for (;;) {
        if (fgets(c->buf, (int)sizeof c->buf, c->f) == NULL) {
            return 0;
        }
        c->line_no++;
        if (strchr(c->buf, '\n') == NULL && !feof(c->f)) {
            fprintf(stderr, "%s:%lu: line longer than %d bytes\n", c->path, c->line_no, MAX_LINE - 2);
            return -1;
        }
        if (c->buf[0] == '#' || c->buf[0] == '\n' || c->buf[0] == '\r') {
            continue;
        }
        c->n_fields = split(c->buf, c->fields);
        if (c->n_fields < 0) {
            fprintf(stderr, "%s:%lu: more than %d fields\n", c->path, c->line_no, MAX_FIELDS);
            return -1;
        }
        return 1;
    }
}

/* Opens a CSV and finds the wanted columns in its header. */
static int csv_open(Csv *c, const char *path, const char *const *names, int n_names) {
    int i, j, r;
    memset(c, 0, sizeof *c);
    c->path = path;
    c->f = fopen(path, "r");
    if (c->f == NULL) {
        fprintf(stderr, "%s: cannot open\n", path);
        return -1;
    }
    r = next_line(c);
    if (r <= 0) {
        fprintf(stderr, "%s: no header line\n", path);
        return -1;
    }
    for (i = 0; i < n_names; i++) {
        c->col[i] = -1;
        for (j = 0; j < c->n_fields; j++) {
            if (strcmp(c->fields[j], names[i]) == 0) {
                c->col[i] = j;
            }
        }
        if (c->col[i] < 0) {
            fprintf(stderr, "%s: no column %s\n", path, names[i]);
            return -1;
        }
    }
    return 0;
}

/* The field of wanted column i in the buffered row, or "" if missing. */
static const char *field(const Csv *c, int i) {
    int k = c->col[i];
    return (k >= 0 && k < c->n_fields) ? c->fields[k] : "";
}

static int parse_u64(const char *s, unsigned long long *out) {
    char *end;
    if (*s == '\0' || *s == '-') {
        return -1;
    }
    *out = strtoull(s, &end, 10);
    return *end == '\0' ? 0 : -1;
}

static int parse_double(const char *s, double *out) {
    char *end;
    if (*s == '\0') {
        return -1;
    }
    *out = strtod(s, &end);
    return *end == '\0' ? 0 : -1;
}

/* Buffers the next row of c (column 0 is the time); 1, 0 at end, -1 error. */
static int advance(Csv *c) {
    int r = next_line(c);
    c->has_row = 0;
    if (r <= 0) {
        return r;
    }
    if (parse_u64(field(c, 0), &c->t_ms) != 0) {
        fprintf(stderr, "%s:%lu: bad t_ms \"%s\"\n", c->path, c->line_no, field(c, 0));
        return -1;
    }
    c->has_row = 1;
    return 1;
}

/* The firmware driver's conversion of a left-justified 12-bit word to g. */
static float word_to_g(long w) {
    long counts = (w >= 0) ? (w / 16) : -((-w + 15) / 16); /* w >> 4, arithmetic */
    return (float)counts * 0.001f;
}

static int accel_inputs(const Csv *c, SfInputs *in) {
    double v[3];
    int i, empty = 0;
    for (i = 0; i < 3; i++) {
        const char *s = field(c, 1 + i);
        if (*s == '\0') {
            empty++;
        } else if (parse_double(s, &v[i]) != 0 || v[i] < -32768.0 || v[i] > 32767.0) {
            fprintf(stderr, "%s:%lu: bad accelerometer word \"%s\"\n", c->path, c->line_no, s);
            return -1;
        }
    }
    if (empty == 3) {
        return 0; /* the sensor did not answer in this row */
    }
    if (empty != 0) {
        fprintf(stderr, "%s:%lu: accelerometer row with %d empty axes\n", c->path, c->line_no, empty);
        return -1;
    }
    in->has_accel = 1;
    for (i = 0; i < 3; i++) {
        in->accel[i] = word_to_g((long)v[i]);
    }
    return 0;
}

/* Values present in a guard-inputs row: wind (speed, from) and pose (ha, dec). */
static int host_inputs(const Csv *c, SfInputs *in) {
    double speed, from, ha, dec;
    const char *s_speed = field(c, 1), *s_from = field(c, 2);
    const char *s_ha = field(c, 3), *s_dec = field(c, 4);
    if (*s_speed != '\0') {
        if (parse_double(s_speed, &speed) != 0) {
            fprintf(stderr, "%s:%lu: bad wind_mps \"%s\"\n", c->path, c->line_no, s_speed);
            return -1;
        }
        in->has_wind = 1;
        in->wind_speed_mps = (float)speed;
        if (*s_from != '\0') {
            if (parse_double(s_from, &from) != 0) {
                fprintf(stderr, "%s:%lu: bad wind_from_rad \"%s\"\n", c->path, c->line_no, s_from);
                return -1;
            }
            in->has_wind_from = 1;
            in->wind_from_rad = (float)from;
        }
    } else if (*s_from != '\0') {
        fprintf(stderr, "%s:%lu: a wind direction without a speed\n", c->path, c->line_no);
        return -1;
    }
    if (*s_ha != '\0' && *s_dec != '\0') {
        if (parse_double(s_ha, &ha) != 0 || parse_double(s_dec, &dec) != 0) {
            fprintf(stderr, "%s:%lu: bad pose\n", c->path, c->line_no);
            return -1;
        }
        in->has_pose = 1;
        in->pose.kind = SF_POSE_EQUATORIAL;
        in->pose.a_rad = (float)ha;
        in->pose.b_rad = (float)dec;
        in->pose.pier_side = SF_PIER_TUBE_EAST; /* the log gives no side */
    }
    return 0;
}

static void print_error(const char *what, SfStatus s, const SfError *e) {
    fprintf(stderr, "%s: %s (field \"%s\", value %g, accepted %g to %g)\n", what, sf_status_name(s),
            (const char *)e->field, (double)e->value, (double)e->min, (double)e->max);
}

/* A step's events as the replay prints them: its raised faults, then the
 * count of events that did not fit in the verdict (if any), then its level
 * change. */
static void print_events(const SfVerdict *v, unsigned long long t_ms) {
    uint32_t i, n = v->event_count < SF_MAX_EVENTS ? v->event_count : SF_MAX_EVENTS;
    for (i = 0; i < n; i++) {
        const SfEvent *e = &v->events[i];
        if (e->kind == SF_EVENT_FAULT_RAISED) {
            printf("event t_ms=%llu kind=fault sensor=%s class=%s\n", t_ms,
                   sf_sensor_name(e->fault.sensor), sf_fault_class_name(e->fault.fault_class));
        }
    }
    if (v->events_lost > 0) {
        printf("event t_ms=%llu kind=events_lost count=%lu\n", t_ms, (unsigned long)v->events_lost);
    }
    for (i = 0; i < n; i++) {
        const SfEvent *e = &v->events[i];
        if (e->kind == SF_EVENT_LEVEL_CHANGED) {
            printf("event t_ms=%llu kind=level from=%s to=%s\n", t_ms, sf_level_name(e->from_level),
                   sf_level_name(e->to_level));
        }
    }
}

int main(int argc, char **argv) {
    static const char *const accel_cols[] = {"t_ms", "accel_x", "accel_y", "accel_z"};
    static const char *const host_cols[] = {"t_ms", "wind_mps", "wind_from_rad", "ha_rad", "dec_rad"};
    Csv accel, host;
    FILE *f;
    size_t image_size;
    SfGuard *guard = NULL;
    SfError err;
    SfStatus s;
    int have_t0 = 0, ra, rh;
    unsigned long long t0 = 0, last = 0;

    if (argc != 4) {
        fprintf(stderr, "usage: %s RIG_IMAGE ACCEL_LOG GUARD_INPUTS\n", argc > 0 ? argv[0] : "replay_events");
        return 1;
    }
    if (sf_abi_version() != SF_ABI_VERSION) {
        fprintf(stderr, "library ABI %u, header ABI %u\n", (unsigned)sf_abi_version(), (unsigned)SF_ABI_VERSION);
        return 2;
    }
    if ((uintptr_t)storage.bytes % sf_guard_storage_align() != 0 ||
        sizeof storage.bytes < sf_guard_storage_size()) {
        fprintf(stderr, "guard storage does not meet the library's size or alignment\n");
        return 2;
    }

    f = fopen(argv[1], "rb");
    if (f == NULL) {
        fprintf(stderr, "%s: cannot open\n", argv[1]);
        return 1;
    }
    image_size = fread(image, 1, sizeof image, f);
    if (ferror(f) || !feof(f)) {
        /* Either a read error or more bytes than any image may have. */
        fprintf(stderr, "%s: cannot read, or larger than %d bytes\n", argv[1], SF_RIG_IMAGE_MAX_BYTES);
        fclose(f);
        return 1;
    }
    fclose(f);

    if (csv_open(&accel, argv[2], accel_cols, 4) != 0 || csv_open(&host, argv[3], host_cols, 5) != 0) {
        return 1;
    }
    ra = advance(&accel);
    rh = advance(&host);
    while (ra > 0 || rh > 0) {
        SfInputs in;
        SfVerdict v;
        unsigned long long t;
        if (ra < 0 || rh < 0) {
            return 3;
        }
        if (accel.has_row && host.has_row) {
            t = accel.t_ms < host.t_ms ? accel.t_ms : host.t_ms;
        } else {
            t = accel.has_row ? accel.t_ms : host.t_ms;
        }
        if (have_t0 && t <= last) {
            fprintf(stderr, "time %llu ms is not after %llu ms\n", t, last);
            return 3;
        }
        memset(&in, 0, sizeof in);
        if (accel.has_row && accel.t_ms == t) {
            if (accel_inputs(&accel, &in) != 0) {
                return 3;
            }
            ra = advance(&accel);
        }
        if (host.has_row && host.t_ms == t) {
            if (host_inputs(&host, &in) != 0) {
                return 3;
            }
            rh = advance(&host);
        }
        if (!have_t0) {
            t0 = t;
            have_t0 = 1;
            s = sf_guard_init(storage.bytes, sizeof storage.bytes, image, image_size, 0, &guard, &err);
            if (s != SF_OK) {
                print_error("sf_guard_init", s, &err);
                return 2;
            }
        }
        last = t;
        s = sf_guard_step(guard, (uint64_t)(t - t0), &in, &v, &err);
        if (s != SF_OK) {
            print_error("sf_guard_step", s, &err);
            return 2;
        }
        print_events(&v, t - t0);
    }
    if (ra < 0 || rh < 0) {
        return 3;
    }
    if (guard != NULL) {
        sf_guard_fini(guard);
    }
    fclose(accel.f);
    fclose(host.f);
    return 0;
}
