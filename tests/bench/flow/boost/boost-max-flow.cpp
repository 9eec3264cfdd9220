// Reads a DIMACS max-flow file with our own small reader, solves it with the Boost Graph
// Library's boykov_kolmogorov_max_flow or push_relabel_max_flow, and prints one JSON line:
// {"algorithm":..., "value":..., "solveMs":..., "cpuMs":..., "peakRssMb":...}. Only the solver call is timed
// (wall clock and this process's CPU time).
// Usage: boost-max-flow FILE (bk|push-relabel)
#include <boost/graph/adjacency_list.hpp>
#include <boost/graph/boykov_kolmogorov_max_flow.hpp>
#include <boost/graph/push_relabel_max_flow.hpp>
#include <sys/resource.h>
#include <chrono>
#include <ctime>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>
#include <vector>

using namespace boost;
typedef adjacency_list_traits<vecS, vecS, directedS> Traits;
typedef adjacency_list<vecS, vecS, directedS,
    property<vertex_index_t, long,
    property<vertex_color_t, default_color_type,
    property<vertex_distance_t, long,
    property<vertex_predecessor_t, Traits::edge_descriptor>>>>,
    property<edge_capacity_t, long,
    property<edge_residual_capacity_t, long,
    property<edge_reverse_t, Traits::edge_descriptor>>>> Graph;

static void fail(long line, const char* why) {
  std::fprintf(stderr, "line %ld: %s\n", line, why);
  std::exit(2);
}

int main(int argc, char** argv) {
  if (argc != 3) { std::fprintf(stderr, "usage: %s FILE (bk|push-relabel)\n", argv[0]); return 2; }
  std::string algorithm = argv[2];
  FILE* in = std::fopen(argv[1], "rb");
  if (!in) { std::perror(argv[1]); return 2; }
  std::vector<char> text;
  char buffer[1 << 16];
  size_t got;
  while ((got = std::fread(buffer, 1, sizeof buffer, in)) > 0) text.insert(text.end(), buffer, buffer + got);
  std::fclose(in);
  text.push_back('\0');

  long nodes = -1, arcs = 0, source = -1, sink = -1, line = 0;
  std::vector<long> tails, heads, caps;
  for (char* p = text.data(); *p; ) {
    char* end = std::strchr(p, '\n');
    if (end) *end = '\0';
    line++;
    char kind = 0;
    std::sscanf(p, " %c", &kind);
    if (kind == 'p') {
      char word[16];
      if (std::sscanf(p, " p %15s %ld %ld", word, &nodes, &arcs) != 3 || std::strcmp(word, "max") != 0) fail(line, "bad problem line");
      tails.reserve(arcs); heads.reserve(arcs); caps.reserve(arcs);
    } else if (kind == 'n') {
      long id; char which;
      if (std::sscanf(p, " n %ld %c", &id, &which) != 2) fail(line, "bad node line");
      if (which == 's') source = id - 1; else if (which == 't') sink = id - 1; else fail(line, "bad node designator");
    } else if (kind == 'a') {
      // The hot loop: hand-rolled integer parsing, sscanf is too slow for millions of lines.
      char* q = p;
      while (*q == ' ' || *q == '\t' || *q == 'a') q++;
      long v[3];
      for (int k = 0; k < 3; k++) {
        while (*q == ' ' || *q == '\t') q++;
        if (*q < '0' || *q > '9') fail(line, "bad arc line");
        long x = 0;
        while (*q >= '0' && *q <= '9') x = x * 10 + (*q++ - '0');
        v[k] = x;
      }
      tails.push_back(v[0] - 1); heads.push_back(v[1] - 1); caps.push_back(v[2]);
    } else if (kind != 'c' && kind != 0) {
      fail(line, "unknown line type");
    }
    if (!end) break;
    p = end + 1;
  }
  if (nodes < 0 || source < 0 || sink < 0 || (long)tails.size() != arcs) fail(line, "incomplete file");
  std::vector<char>().swap(text);

  Graph g(nodes);
  auto capacity = get(edge_capacity, g);
  auto reverse = get(edge_reverse, g);
  auto residual = get(edge_residual_capacity, g);
  for (long i = 0; i < arcs; i++) {
    Traits::edge_descriptor forward = add_edge(tails[i], heads[i], g).first;
    Traits::edge_descriptor backward = add_edge(heads[i], tails[i], g).first;
    capacity[forward] = caps[i];
    capacity[backward] = 0;
    reverse[forward] = backward;
    reverse[backward] = forward;
  }
  std::vector<long>().swap(tails); std::vector<long>().swap(heads); std::vector<long>().swap(caps);

  auto start = std::chrono::steady_clock::now();
  std::clock_t cpuStart = std::clock();
  long value;
  if (algorithm == "bk") value = boykov_kolmogorov_max_flow(g, vertex(source, g), vertex(sink, g));
  else if (algorithm == "push-relabel") value = push_relabel_max_flow(g, vertex(source, g), vertex(sink, g));
  else { std::fprintf(stderr, "unknown algorithm %s\n", algorithm.c_str()); return 2; }
  double ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - start).count();
  // CPU time of the solver call: steadier than the wall clock on a machine shared with other work.
  double cpuMs = 1000.0 * double(std::clock() - cpuStart) / CLOCKS_PER_SEC;
  (void)residual;

  struct rusage usage;
  getrusage(RUSAGE_SELF, &usage);
  std::printf("{\"algorithm\":\"%s\",\"value\":%ld,\"solveMs\":%.1f,\"cpuMs\":%.1f,\"peakRssMb\":%.1f}\n",
              algorithm.c_str(), value, ms, cpuMs, usage.ru_maxrss / 1024.0);
  return 0;
}
