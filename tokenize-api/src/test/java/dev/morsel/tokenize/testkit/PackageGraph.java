package dev.morsel.tokenize.testkit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.DataInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.lang.module.ModuleDescriptor;
import java.net.JarURLConnection;
import java.net.URISyntaxException;
import java.net.URL;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.jar.JarFile;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

/**
 * The package dependencies of a module's compiled classes, read from the class files themselves
 * (the constant pool of JVMS 17 §4.4: every {@code CONSTANT_Class} entry, and every class named in a
 * field, method or generic descriptor), so a dependency that only the bytecode shows is seen too.
 * Shared by every module's {@code ModuleDescriptorTest}; two checks:
 *
 * <ul>
 *   <li>no package cycle inside the module: the package graph is acyclic (Tarjan's strongly
 *       connected components, Tarjan 1972, "Depth-first search and linear graph algorithms");
 *   <li>classes of other Morsel modules are used only from packages those modules export, to
 *       everyone or by a qualified export to this module (their compiled descriptors are read with
 *       {@link ModuleDescriptor#read}).
 * </ul>
 */
public final class PackageGraph {
  private static final Path CLASSES = Paths.get("target/classes");
  /** Class names inside descriptors and signatures: {@code Lbinary/name;} or {@code Lbinary/name<}. */
  private static final Pattern DESCRIPTOR_CLASS = Pattern.compile("L([A-Za-z_$][A-Za-z0-9_$/]*)[;<]");
  private static final String OURS = "dev.morsel.";

  private final Map<String, Set<String>> edges; // package -> packages it uses (Morsel's only)
  private final Map<String, Set<String>> users; // used class -> classes of this module that use it (Morsel's only)
  private final Set<String> ownPackages;

  private PackageGraph(Map<String, Set<String>> edges, Map<String, Set<String>> users, Set<String> ownPackages) {
    this.edges = edges;
    this.users = users;
    this.ownPackages = ownPackages;
  }

  /** The graph of the module under test ({@code target/classes}). */
  public static PackageGraph ofModuleUnderTest() {
    return of(CLASSES);
  }

  /** The graph of the classes under {@code root}. */
  public static PackageGraph of(Path root) {
    Map<String, Set<String>> edges = new TreeMap<>();
    Map<String, Set<String>> users = new TreeMap<>();
    Set<String> own = new TreeSet<>();
    try (Stream<Path> files = Files.walk(root)) {
      for (Path f : (Iterable<Path>) files.filter(p -> p.toString().endsWith(".class"))::iterator) {
        if (f.getFileName().toString().equals("module-info.class")) {
          continue;
        }
        String name = root.relativize(f).toString().replace(java.io.File.separatorChar, '/');
        String self = name.substring(0, name.length() - ".class".length()).replace('/', '.');
        String pkg = packageOf(self);
        own.add(pkg);
        Set<String> out = edges.computeIfAbsent(pkg, k -> new TreeSet<>());
        for (String used : referencedClasses(Files.readAllBytes(f))) {
          if (used.startsWith(OURS)) {
            out.add(packageOf(used));
            users.computeIfAbsent(used, k -> new TreeSet<>()).add(self);
          }
        }
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return new PackageGraph(edges, users, own);
  }

  /** A graph of the given package edges, for tests of the checks themselves. */
  public static PackageGraph ofEdges(Map<String, Set<String>> edges) {
    Set<String> own = new TreeSet<>(edges.keySet());
    edges.values().forEach(own::addAll);
    return new PackageGraph(new TreeMap<>(edges), new TreeMap<>(), own);
  }

  /** The packages of this module that {@code pkg} uses, itself left out. */
  public Set<String> uses(String pkg) {
    Set<String> out = new TreeSet<>(edges.getOrDefault(pkg, Set.of()));
    out.remove(pkg);
    out.retainAll(ownPackages);
    return out;
  }

  /** The packages of this module. */
  public Set<String> packages() {
    return ownPackages;
  }

  /** The package cycles: strongly connected components of more than one package, each sorted. */
  public List<Set<String>> cycles() {
    // Tarjan's algorithm, iterative over the package graph of this module
    Map<String, Integer> index = new HashMap<>();
    Map<String, Integer> low = new HashMap<>();
    Deque<String> stack = new ArrayDeque<>();
    Set<String> onStack = new TreeSet<>();
    List<Set<String>> out = new ArrayList<>();
    int[] counter = {0};
    for (String start : ownPackages) {
      if (!index.containsKey(start)) {
        strongConnect(start, index, low, stack, onStack, out, counter);
      }
    }
    return out;
  }

  private void strongConnect(String v, Map<String, Integer> index, Map<String, Integer> low, Deque<String> stack,
      Set<String> onStack, List<Set<String>> out, int[] counter) {
    index.put(v, counter[0]);
    low.put(v, counter[0]++);
    stack.push(v);
    onStack.add(v);
    for (String w : uses(v)) {
      if (!index.containsKey(w)) {
        strongConnect(w, index, low, stack, onStack, out, counter);
        low.put(v, Math.min(low.get(v), low.get(w)));
      } else if (onStack.contains(w)) {
        low.put(v, Math.min(low.get(v), index.get(w)));
      }
    }
    if (low.get(v).equals(index.get(v))) {
      Set<String> component = new TreeSet<>();
      String w;
      do {
        w = stack.pop();
        onStack.remove(w);
        component.add(w);
      } while (!w.equals(v));
      if (component.size() > 1) {
        out.add(component);
      }
    }
  }

  /** Fails listing the cycles, with the edges that close them, if the module's packages form any. */
  public void assertNoPackageCycles() {
    List<Set<String>> cycles = cycles();
    StringBuilder why = new StringBuilder();
    for (Set<String> c : cycles) {
      why.append("\n  cycle ").append(c).append(':');
      for (String p : c) {
        Set<String> in = new TreeSet<>(uses(p));
        in.retainAll(c);
        why.append("\n    ").append(p).append(" -> ").append(in);
      }
    }
    assertTrue(cycles.isEmpty(), "package cycles in " + CLASSES.toAbsolutePath() + why);
  }

  /**
   * The classes of other Morsel modules used from packages their module does not export to this one
   * ({@code thisModule}, the name of the module under test, or null without a descriptor), each with
   * the classes of this module that use it.
   */
  public Map<String, Set<String>> usesOfUnexportedPackages(String thisModule) {
    Map<String, Set<String>> bad = new TreeMap<>();
    Map<String, Optional<ModuleDescriptor>> descriptors = new HashMap<>();
    for (Map.Entry<String, Set<String>> e : users.entrySet()) {
      String used = e.getKey();
      String pkg = packageOf(used);
      if (ownPackages.contains(pkg)) {
        continue;
      }
      Optional<ModuleDescriptor> d = descriptors.computeIfAbsent(pkg, p -> descriptorOf(used));
      if (d.isEmpty()) {
        continue; // a module without a descriptor exports everything it has
      }
      boolean exported = d.get().exports().stream().anyMatch(x -> x.source().equals(pkg)
          && (!x.isQualified() || (thisModule != null && x.targets().contains(thisModule))));
      if (!exported) {
        bad.put(used + " (module " + d.get().name() + ")", e.getValue());
      }
    }
    return bad;
  }

  /** Fails naming each class of another module that is used from a package not exported to this module. */
  public void assertUsesOnlyExportedPackages(String thisModule) {
    assertEquals(Map.of(), usesOfUnexportedPackages(thisModule),
        "classes of packages their module does not export to " + thisModule + ", with their users here");
  }

  // ------------------------------------------------------------------ internals

  private static String packageOf(String className) {
    int dot = className.lastIndexOf('.');
    return dot < 0 ? "" : className.substring(0, dot);
  }

  /** The compiled descriptor of the module that holds {@code className} on the test class path, if it has one. */
  private static Optional<ModuleDescriptor> descriptorOf(String className) {
    String resource = className.replace('.', '/') + ".class";
    URL url = PackageGraph.class.getClassLoader().getResource(resource);
    if (url == null) {
      throw new AssertionError("class " + className + " is used but not on the test class path");
    }
    try {
      if (url.getProtocol().equals("jar")) {
        JarURLConnection c = (JarURLConnection) url.openConnection();
        c.setUseCaches(false);
        try (JarFile jar = new JarFile(Paths.get(c.getJarFileURL().toURI()).toFile())) {
          var entry = jar.getJarEntry("module-info.class");
          if (entry == null) {
            return Optional.empty();
          }
          try (InputStream in = jar.getInputStream(entry)) {
            return Optional.of(ModuleDescriptor.read(in));
          }
        }
      }
      Path file = Paths.get(url.toURI());
      Path root = file;
      for (int i = 0; i < resource.split("/").length; i++) {
        root = root.getParent();
      }
      Path info = root.resolve("module-info.class");
      if (!Files.isRegularFile(info)) {
        return Optional.empty();
      }
      try (InputStream in = Files.newInputStream(info)) {
        return Optional.of(ModuleDescriptor.read(in));
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    } catch (URISyntaxException e) {
      throw new IllegalStateException(e);
    }
  }

  /**
   * The classes a class file refers to, as binary names with dots: the {@code CONSTANT_Class} entries
   * (arrays reduced to their element class) and the classes named in {@code CONSTANT_Utf8} entries
   * used as descriptors or signatures (not those behind a {@code CONSTANT_String}, which are text).
   */
  public static Set<String> referencedClasses(byte[] classFile) throws IOException {
    DataInputStream in = new DataInputStream(new java.io.ByteArrayInputStream(classFile));
    if (in.readInt() != 0xCAFEBABE) {
      throw new IOException("not a class file");
    }
    in.readUnsignedShort(); // minor
    in.readUnsignedShort(); // major
    int count = in.readUnsignedShort();
    String[] utf8 = new String[count];
    int[] classNameIndex = new int[count];
    boolean[] isStringText = new boolean[count];
    List<Integer> classEntries = new ArrayList<>();
    for (int i = 1; i < count; i++) {
      int tag = in.readUnsignedByte();
      switch (tag) {
        case 1: // Utf8
          utf8[i] = in.readUTF();
          break;
        case 3: // Integer
        case 4: // Float
          in.readInt();
          break;
        case 5: // Long
        case 6: // Double
          in.readLong();
          i++; // takes two entries (JVMS 4.4.5)
          break;
        case 7: // Class
          classNameIndex[i] = in.readUnsignedShort();
          classEntries.add(i);
          break;
        case 8: // String
          isStringText[in.readUnsignedShort()] = true;
          break;
        case 16: // MethodType
        case 19: // Module
        case 20: // Package
          in.readUnsignedShort();
          break;
        case 9: // Fieldref
        case 10: // Methodref
        case 11: // InterfaceMethodref
        case 12: // NameAndType
        case 17: // Dynamic
        case 18: // InvokeDynamic
          in.readInt();
          break;
        case 15: // MethodHandle
          in.readUnsignedByte();
          in.readUnsignedShort();
          break;
        default:
          throw new IOException("unknown constant pool tag " + tag + " at entry " + i);
      }
    }
    Set<String> out = new TreeSet<>();
    for (int i : classEntries) {
      String n = utf8[classNameIndex[i]];
      if (n.startsWith("[")) {
        Matcher m = DESCRIPTOR_CLASS.matcher(n);
        while (m.find()) {
          out.add(m.group(1).replace('/', '.'));
        }
      } else {
        out.add(n.replace('/', '.'));
      }
    }
    for (int i = 1; i < count; i++) {
      if (utf8[i] != null && !isStringText[i] && utf8[i].indexOf('L') >= 0
          && (utf8[i].startsWith("(") || utf8[i].startsWith("L") || utf8[i].startsWith("[") || utf8[i].startsWith("<"))) {
        Matcher m = DESCRIPTOR_CLASS.matcher(utf8[i]);
        while (m.find()) {
          out.add(m.group(1).replace('/', '.'));
        }
      }
    }
    return out;
  }
}
