package io.densa.io.raster;

import java.util.Objects;

/**
 * The coordinate reference system of a raster, as written to GeoTIFF GeoKeys (OGC GeoTIFF 1.1,
 * OGC 19-008r4, §7.4): a projected or a geographic CRS given by its EPSG code, or a local planar CRS
 * without a code (invented or site coordinates) described by a citation and a linear unit.
 *
 * <p>Immutable.
 */
public final class Crs {
    /** GeoTIFF "user-defined" key value (OGC GeoTIFF 1.1, §7.4.2). */
    static final int USER_DEFINED = 32767;

    private final boolean geographic;
    private final int code;
    private final String citation;
    private final int linearUnit;

    private Crs(boolean geographic, int code, String citation, int linearUnit) {
        this.geographic = geographic;
        this.code = code;
        this.citation = citation;
        this.linearUnit = linearUnit;
    }

    /**
     * A projected CRS by EPSG code (e.g. 32633 for UTM zone 33N): GTModelTypeGeoKey = 1 (projected),
     * ProjectedCSTypeGeoKey = code.
     *
     * @throws IllegalArgumentException unless 1024 ≤ code ≤ 32766 (the EPSG range GeoTIFF keys hold)
     */
    public static Crs projected(int epsg) {
        check(epsg);
        return new Crs(false, epsg, null, 0);
    }

    /**
     * A geographic CRS by EPSG code (e.g. 4326 for WGS 84): GTModelTypeGeoKey = 2 (geographic),
     * GeographicTypeGeoKey = code; cell sizes are then in degrees.
     */
    public static Crs geographic(int epsg) {
        check(epsg);
        return new Crs(true, epsg, null, 0);
    }

    /**
     * A local planar CRS with no EPSG code: ProjectedCSTypeGeoKey = 32767 (user-defined), the
     * description in GTCitationGeoKey and the linear unit as an EPSG unit code in
     * ProjLinearUnitsGeoKey (9001 metre, 9036 kilometre).
     *
     * @param description ASCII text without '|', at most 200 characters
     */
    public static Crs local(String description, int linearUnitEpsg) {
        Objects.requireNonNull(description, "description");
        if (description.isEmpty() || description.length() > 200 || description.indexOf('|') >= 0
                || !description.chars().allMatch(c -> c >= 32 && c < 127)) {
            throw new IllegalArgumentException("CRS description must be 1-200 printable ASCII characters without"
                    + " '|', got '" + description + "'");
        }
        if (linearUnitEpsg < 9000 || linearUnitEpsg > 9199) {
            throw new IllegalArgumentException("linear unit must be an EPSG unit code in 9000..9199 (9001 metre,"
                    + " 9036 kilometre), got " + linearUnitEpsg);
        }
        return new Crs(false, USER_DEFINED, description, linearUnitEpsg);
    }

    private static void check(int epsg) {
        if (epsg < 1024 || epsg > 32766) {
            throw new IllegalArgumentException("EPSG code " + epsg + " is outside 1024..32766");
        }
    }

    /** Whether the CRS is geographic (longitude/latitude). */
    public boolean isGeographic() {
        return geographic;
    }

    /** The EPSG code, or 32767 for a local CRS. */
    public int code() {
        return code;
    }

    /** The citation of a local CRS, or null. */
    public String citation() {
        return citation;
    }

    int linearUnit() {
        return linearUnit;
    }

    @Override
    public boolean equals(Object o) {
        if (!(o instanceof Crs)) {
            return false;
        }
        Crs c = (Crs) o;
        return geographic == c.geographic && code == c.code && Objects.equals(citation, c.citation)
                && linearUnit == c.linearUnit;
    }

    @Override
    public int hashCode() {
        return Objects.hash(geographic, code, citation, linearUnit);
    }

    @Override
    public String toString() {
        return citation != null ? "Crs[local '" + citation + "', unit EPSG:" + linearUnit + "]"
                : "Crs[" + (geographic ? "geographic" : "projected") + " EPSG:" + code + "]";
    }
}
