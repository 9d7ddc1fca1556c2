package org.dendrokin.io.movie;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import javax.xml.XMLConstants;
import javax.xml.parsers.DocumentBuilder;
import javax.xml.parsers.DocumentBuilderFactory;
import javax.xml.parsers.ParserConfigurationException;

import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.Node;
import org.xml.sax.ErrorHandler;
import org.xml.sax.InputSource;
import org.xml.sax.SAXException;
import org.xml.sax.SAXParseException;

import org.dendrokin.io.InputException;

/**
 * What this tool uses of an OME-TIFF's metadata: the OME-XML document that the OME-TIFF format keeps in the first
 * image's ImageDescription tag (Open Microscopy Environment data model). Only the first {@code Image} is read, from
 * its {@code Pixels} element: the sizes SizeX, SizeY, SizeC, SizeZ, SizeT and the DimensionOrder; PhysicalSizeX and
 * PhysicalSizeY with their units, converted to um; TimeIncrement with its unit, converted to s; the channels'
 * names; and where each plane lies (its {@code TiffData} elements: IFD, FirstC, FirstZ, FirstT, PlaneCount, UUID).
 * The XML is parsed by the JDK's parser with document type declarations refused, so no external entity is ever
 * fetched.
 */
final class OmeXml {
    final int sizeX;
    final int sizeY;
    final int sizeC;
    final int sizeZ;
    final int sizeT;
    final String dimensionOrder;
    /** Pixel width and height, um; NaN when absent or in a unit this tool does not convert. */
    final double pixelWidthUm;
    final double pixelHeightUm;
    /** Time between time points, s; NaN when absent or in a unit this tool does not convert. */
    final double timeIncrementS;
    /** One name a channel ("" where the metadata gives none). */
    final List<String> channelNames;
    /** Number of Image elements (series) in the document; only the first is read. */
    final int imageCount;
    /** Sentences about values that were present but could not be used. */
    final List<String> notes;
    private final int[] ifdOfPlane;

    private OmeXml(Element pixels, int imageCount, int ifdCount, String rootUuid, Path file) {
        this.imageCount = imageCount;
        this.notes = new ArrayList<>();
        sizeX = size(pixels, "SizeX", file);
        sizeY = size(pixels, "SizeY", file);
        sizeC = size(pixels, "SizeC", file);
        sizeZ = size(pixels, "SizeZ", file);
        sizeT = size(pixels, "SizeT", file);
        dimensionOrder = pixels.getAttribute("DimensionOrder").trim();
        if (!dimensionOrder.matches("XY(ZCT|ZTC|CZT|CTZ|TCZ|TZC)")) {
            throw new InputException(file, "the OME metadata gives the dimension order \"" + dimensionOrder
                    + "\", which is not one of the six the OME format allows");
        }
        pixelWidthUm = length(pixels, "PhysicalSizeX");
        pixelHeightUm = length(pixels, "PhysicalSizeY");
        timeIncrementS = time(pixels, "TimeIncrement");
        List<String> names = new ArrayList<>();
        for (Element channel : children(pixels, "Channel")) {
            names.add(channel.getAttribute("Name").trim());
        }
        channelNames = names.size() == sizeC ? List.copyOf(names) : List.of();
        ifdOfPlane = planes(pixels, ifdCount, rootUuid, file);
    }

    /** True if an image description is (most likely) an OME-XML document. */
    static boolean looksLikeOme(byte[] description) {
        if (description == null) {
            return false;
        }
        String head = new String(description, 0, Math.min(description.length, 4096), StandardCharsets.ISO_8859_1);
        return head.trim().startsWith("<") && (head.contains("<OME") || head.contains(":OME"));
    }

    /**
     * Parses an OME-XML image description.
     *
     * @param xml      the description's bytes as they are in the file (the XML declaration gives the encoding)
     * @param ifdCount number of image directories in the TIFF
     * @param file     the TIFF, named in messages
     * @param warnings receives a sentence if the document cannot be used
     * @return the metadata, or null (with a warning) if the document is not usable OME-XML
     * @throws InputException if the metadata describes images this file cannot provide: planes in other files,
     *                        planes it does not place, or image directories beyond the file's
     */
    static OmeXml parse(byte[] xml, int ifdCount, Path file, List<String> warnings) {
        Document doc;
        try {
            doc = builder().parse(new InputSource(new ByteArrayInputStream(xml)));
        } catch (SAXException | IOException e) {
            warnings.add("The OME metadata of " + file.getFileName() + " could not be read as XML ("
                    + e.getMessage().replaceAll("\\s+", " ").trim() + "); it was ignored.");
            return null;
        }
        Element root = doc.getDocumentElement();
        if (!"OME".equals(root.getLocalName())) {
            return null;
        }
        if (!children(root, "BinaryOnly").isEmpty()) {
            warnings.add("The OME metadata of " + file.getFileName() + " is kept in a companion file, which this tool "
                    + "does not read; the images were read as a plain stack.");
            return null;
        }
        List<Element> images = children(root, "Image");
        List<Element> pixels = images.isEmpty() ? List.of() : children(images.get(0), "Pixels");
        if (pixels.isEmpty()) {
            warnings.add("The OME metadata of " + file.getFileName() + " describes no image; it was ignored.");
            return null;
        }
        String uuid = root.getAttribute("UUID").trim();
        return new OmeXml(pixels.get(0), images.size(), ifdCount, uuid.isEmpty() ? null : uuid, file);
    }

    private static DocumentBuilder builder() {
        try {
            DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
            f.setNamespaceAware(true);
            f.setFeature(XMLConstants.FEATURE_SECURE_PROCESSING, true);
            f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", true);
            f.setXIncludeAware(false);
            f.setExpandEntityReferences(false);
            DocumentBuilder b = f.newDocumentBuilder();
            b.setErrorHandler(SILENT);
            return b;
        } catch (ParserConfigurationException e) {
            throw new IllegalStateException("the JDK's XML parser refused a standard setting", e);
        }
    }

    /** Reports problems by exception only; the parser's default handler would also print them. */
    private static final ErrorHandler SILENT = new ErrorHandler() {
        @Override
        public void warning(SAXParseException e) {
            // a warning does not stop the parse and says nothing the user can act on
        }

        @Override
        public void error(SAXParseException e) throws SAXException {
            throw e;
        }

        @Override
        public void fatalError(SAXParseException e) throws SAXException {
            throw e;
        }
    };

    /**
     * The image directory that holds each plane, planes in ImageJ's order (channel fastest, then z, then time), or
     * -1 where the metadata places none.
     */
    int ifdOf(int channel, int z, int t) {
        return ifdOfPlane[channel + sizeC * (z + sizeZ * t)];
    }

    private int[] planes(Element pixels, int ifdCount, String rootUuid, Path file) {
        long total = (long) sizeC * sizeZ * sizeT;
        if (total > Integer.MAX_VALUE / 2) {
            throw new InputException(file, "the OME metadata gives " + total + " planes, far more than a TIFF holds");
        }
        int planes = (int) total;
        int[] ifd = new int[planes];
        Arrays.fill(ifd, -1);
        List<Element> tiffData = children(pixels, "TiffData");
        boolean elsewhere = false;
        if (tiffData.isEmpty()) {
            for (int p = 0; p < planes; p++) {
                ifd[imageJIndex(p)] = p;
            }
        }
        for (Element td : tiffData) {
            int first = orderIndex(count(td, "FirstC", 0, file), count(td, "FirstZ", 0, file),
                    count(td, "FirstT", 0, file), file);
            int start = count(td, "IFD", 0, file);
            int n = td.hasAttribute("PlaneCount") ? count(td, "PlaneCount", 0, file)
                    : td.hasAttribute("IFD") ? 1 : ifdCount;
            boolean inOtherFile = inOtherFile(td, rootUuid, file);
            elsewhere |= inOtherFile && n > 0;
            for (int k = 0; k < n && first + k < planes; k++) {
                ifd[imageJIndex(first + k)] = inOtherFile ? -2 : start + k;
            }
        }
        if (elsewhere) {
            throw new InputException(file, "the OME metadata places images of this movie in other files (a "
                    + "multi-file OME-TIFF data set), which this tool does not read; save the movie as one TIFF");
        }
        int highest = -1;
        for (int p = 0; p < planes; p++) {
            if (ifd[p] < 0 && planes > ifdCount) {
                throw new InputException(file, "the TIFF is truncated: its OME metadata describes " + planes
                        + " planes but the file holds only " + ifdCount + " images");
            }
            if (ifd[p] < 0) {
                int c = p % sizeC;
                int z = p / sizeC % sizeZ;
                int t = p / sizeC / sizeZ;
                throw new InputException(file, String.format(Locale.ROOT, "the OME metadata gives no image for "
                        + "channel %d, z-slice %d, time point %d", c + 1, z + 1, t + 1));
            }
            highest = Math.max(highest, ifd[p]);
        }
        if (highest >= ifdCount) {
            throw new InputException(file, "the TIFF is truncated: its OME metadata places images in " + (highest + 1)
                    + " image directories but the file holds only " + ifdCount);
        }
        return ifd;
    }

    private boolean inOtherFile(Element tiffData, String rootUuid, Path file) {
        List<Element> uuids = children(tiffData, "UUID");
        if (uuids.isEmpty()) {
            return false;
        }
        String uuid = uuids.get(0).getTextContent().trim();
        String fileName = uuids.get(0).getAttribute("FileName").trim();
        if (rootUuid != null && !uuid.isEmpty()) {
            return !rootUuid.equals(uuid);
        }
        return !fileName.isEmpty() && !fileName.equals(String.valueOf(file.getFileName()));
    }

    /** Index of the plane (c, z, t) in the dimension order, first dimension fastest. */
    private int orderIndex(int c, int z, int t, Path file) {
        if (c >= sizeC || z >= sizeZ || t >= sizeT) {
            throw new InputException(file, "the OME metadata places an image at channel " + (c + 1) + ", z-slice "
                    + (z + 1) + ", time point " + (t + 1) + ", beyond its own sizes");
        }
        int index = 0;
        for (int i = 4; i >= 2; i--) {
            char d = dimensionOrder.charAt(i);
            index = index * extent(d) + (d == 'C' ? c : d == 'Z' ? z : t);
        }
        return index;
    }

    /** ImageJ's index (channel fastest, then z, then t) of the plane at {@code index} in the dimension order. */
    private int imageJIndex(int index) {
        int[] at = new int[3];  // c, z, t
        int rest = index;
        for (int i = 2; i <= 4; i++) {
            char d = dimensionOrder.charAt(i);
            int n = extent(d);
            at[d == 'C' ? 0 : d == 'Z' ? 1 : 2] = rest % n;
            rest /= n;
        }
        return at[0] + sizeC * (at[1] + sizeZ * at[2]);
    }

    private int extent(char dimension) {
        return dimension == 'C' ? sizeC : dimension == 'Z' ? sizeZ : sizeT;
    }

    private static int size(Element e, String name, Path file) {
        int v = count(e, name, -1, file);
        if (v < 1) {
            throw new InputException(file, "the OME metadata gives no positive " + name);
        }
        return v;
    }

    private static int count(Element e, String name, int fallback, Path file) {
        if (!e.hasAttribute(name)) {
            return fallback;
        }
        try {
            int v = Integer.parseInt(e.getAttribute(name).trim());
            if (v < 0) {
                throw new NumberFormatException();
            }
            return v;
        } catch (NumberFormatException ex) {
            throw new InputException(file, "the OME metadata gives " + name + " = \"" + e.getAttribute(name)
                    + "\", which is not a whole number of at least 0");
        }
    }

    private double length(Element pixels, String name) {
        return converted(pixels, name, "um", OmeXml::micrometresPer, "\u00b5m");
    }

    private double time(Element pixels, String name) {
        return converted(pixels, name, "s", OmeXml::secondsPer, "s");
    }

    private double converted(Element pixels, String name, String target, java.util.function.ToDoubleFunction<String>
            factor, String defaultUnit) {
        if (!pixels.hasAttribute(name)) {
            return Double.NaN;
        }
        String unit = pixels.hasAttribute(name + "Unit") ? pixels.getAttribute(name + "Unit").trim() : defaultUnit;
        double value;
        try {
            value = Double.parseDouble(pixels.getAttribute(name).trim());
        } catch (NumberFormatException e) {
            value = Double.NaN;
        }
        double perUnit = factor.applyAsDouble(unit);
        if (!(value > 0) || !Double.isFinite(value)) {
            notes.add(name + " is " + pixels.getAttribute(name) + ", not a positive number");
            return Double.NaN;
        }
        if (!(perUnit > 0)) {
            notes.add(name + " is in \"" + unit + "\", a unit this tool does not convert to " + target);
            return Double.NaN;
        }
        return value * perUnit;
    }

    /** Micrometres per OME length unit (the UnitsLength names), or 0 for a unit not converted. */
    static double micrometresPer(String unit) {
        switch (unit) {
            case "m":
                return 1e6;
            case "dm":
                return 1e5;
            case "cm":
                return 1e4;
            case "mm":
                return 1e3;
            case "\u00b5m":
            case "\u03bcm":
            case "um":
                return 1;
            case "nm":
                return 1e-3;
            case "pm":
                return 1e-6;
            case "\u00c5":
            case "\u212b":
                return 1e-4;
            default:
                return 0;
        }
    }

    /** Seconds per OME time unit (the UnitsTime names), or 0 for a unit not converted. */
    static double secondsPer(String unit) {
        switch (unit) {
            case "s":
                return 1;
            case "ds":
                return 0.1;
            case "cs":
                return 0.01;
            case "ms":
                return 1e-3;
            case "\u00b5s":
            case "\u03bcs":
            case "us":
                return 1e-6;
            case "ns":
                return 1e-9;
            case "ps":
                return 1e-12;
            case "min":
                return 60;
            case "h":
                return 3600;
            case "d":
                return 86400;
            default:
                return 0;
        }
    }

    private static List<Element> children(Element parent, String localName) {
        List<Element> out = new ArrayList<>();
        for (Node n = parent.getFirstChild(); n != null; n = n.getNextSibling()) {
            if (n instanceof Element && localName.equals(n.getLocalName())) {
                out.add((Element) n);
            }
        }
        return out;
    }
}
