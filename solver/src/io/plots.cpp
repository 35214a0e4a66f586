#include "flapline/io/plots.hpp"

#include <unistd.h>

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>

namespace flapline::io {
namespace {

namespace fs = std::filesystem;

std::string quoted(const std::string& s) {
  std::string out = "\"";
  for (char c : s) {
    if (c == '\n') {
      out += "\\n";
      continue;
    }
    if (c == '"' || c == '\\') out += '\\';
    out += c;
  }
  return out + "\"";
}

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

/// A private temporary folder removed on scope exit.
struct TempFolder {
  fs::path path;
  TempFolder() {
    std::string pattern = (fs::temp_directory_path() / "flapline-plot-XXXXXX").string();
    if (!::mkdtemp(pattern.data())) throw std::runtime_error("cannot create a temporary folder");
    path = pattern;
  }
  ~TempFolder() {
    std::error_code ec;
    fs::remove_all(path, ec);
  }
};

}  // namespace

bool gnuplot_available() {
  static const bool available = [] {
    const int rc =
        std::system("gnuplot -e \"set terminal pngcairo; set terminal svg\" > /dev/null 2>&1");
    return rc == 0;
  }();
  return available;
}

std::map<std::string, std::string> render(const Plot& plot, const std::string& stem) {
  return render(plot, ColourMap{}, stem);
}

std::map<std::string, std::string> render(const Plot& plot, const ColourMap& map,
                                          const std::string& stem) {
  TempFolder tmp;
  {
    std::ofstream data(tmp.path / "data.dat");
    data.precision(10);
    for (std::size_t i = 0; i < plot.series.size(); ++i) {
      const Series& s = plot.series[i];
      data << "# " << s.title << "\n";
      for (std::size_t k = 0; k < s.x.size(); ++k) {
        data << s.x[k] << " " << s.y[k];
        if (s.style == "vectors") data << " " << s.dx[k] << " " << s.dy[k];
        data << "\n";
      }
      data << "\n\n";
    }
  }
  const bool is_map = !map.z.empty();
  if (is_map) {
    std::ofstream data(tmp.path / "map.dat");
    data.precision(10);
    for (std::size_t i = 0; i < map.x.size(); ++i) {
      for (std::size_t j = 0; j < map.y.size(); ++j)
        data << map.x[i] << " " << map.y[j] << " " << map.z[i][j] << "\n";
      data << "\n";
    }
  }
  std::ostringstream gp;
  gp << "set encoding utf8\n";
  gp << "set title " << quoted(plot.note.empty() ? plot.title : plot.title + "\n" + plot.note)
     << " noenhanced\n";
  gp << "set xlabel " << quoted(plot.xlabel) << " noenhanced\n";
  gp << "set ylabel " << quoted(plot.ylabel) << " noenhanced\n";
  if (!plot.y2label.empty())
    gp << "set y2label " << quoted(plot.y2label) << " noenhanced\nset y2tics\nset ytics nomirror\n";
  gp << "set grid lc rgb '#d0d0d0'\n";
  gp << "set key " << plot.key << " noenhanced box opaque\n";
  if (plot.log_x) gp << "set logscale x\n";
  if (plot.equal_axes)
    gp << "set size ratio -1\nset bmargin 7\nset offsets graph 0.05, graph 0.05, graph 0.08, graph "
          "0.08\n";
  std::ostringstream cmd;
  if (is_map) {
    gp << "set view map\nset pm3d map interpolate 0,0\nset palette rgb 33,13,10\n";
    gp << "set cblabel " << quoted(map.zlabel) << " noenhanced\n";
    gp << "set xrange [*:*] noextend\nset yrange [*:*] noextend\n";
    auto tics = [&](const char* axis, const std::vector<double>& at,
                    const std::vector<std::string>& labels) {
      if (labels.empty()) return;
      gp << "set " << axis << "tics (";
      for (std::size_t i = 0; i < labels.size() && i < at.size(); ++i)
        gp << (i ? ", " : "") << quoted(labels[i]) << " " << at[i];
      gp << ") noenhanced\n";
    };
    tics("x", map.x, map.xtics);
    tics("y", map.y, map.ytics);
    if (!map.xtics.empty()) gp << "set xtics rotate by -30\n";
    if (map.cells) {
      gp << "set xrange [" << map.x.front() - 0.5 << ":" << map.x.back() + 0.5 << "]\n";
      gp << "set yrange [" << map.y.back() + 0.5 << ":" << map.y.front() - 0.5 << "]\n";
      gp << "set cbrange [-1:1]\nset palette defined (-1 '#2166ac', 0 '#f7f7f7', 1 '#b2182b')\n";
      cmd << "plot 'map.dat' using 1:2:3 with image notitle";
    } else {
      cmd << "splot 'map.dat' using 1:2:3 with pm3d notitle";
    }
    if (!plot.series.empty()) cmd << ", ";
  } else {
    cmd << "plot ";
  }
  for (std::size_t i = 0; i < plot.series.size(); ++i) {
    const Series& s = plot.series[i];
    if (i) cmd << ", ";
    cmd << "'data.dat' index " << i;
    if (is_map) {  // points on top of the map (e.g. the cases), at the map's top
      cmd << " using 1:2:(0) with points pt 7 ps 0.5 lc rgb 'black' title " << quoted(s.title);
      continue;
    }
    if (s.style == "vectors")
      cmd << " using 1:2:3:4 with vectors nohead lw 1.5";
    else
      cmd << " using 1:2 with " << s.style;
    if (s.line_type > 0) cmd << " lt " << s.line_type;
    if (s.style == "lines" || s.style == "linespoints") cmd << " lw 2";
    if (s.dashed) cmd << " dt 2";
    if (s.style == "points" || s.style == "linespoints") cmd << " pt 7 ps 0.8";
    if (s.second_axis) cmd << " axes x1y2";
    cmd << " title " << quoted(s.title);
  }
  cmd << "\n";
  gp << "set terminal pngcairo size 1000,640 font 'Sans,11'\n";
  gp << "set output " << quoted(stem + ".png") << "\n" << cmd.str();
  gp << "set terminal svg size 1000,640 dynamic font 'Sans,11'\n";
  gp << "set output " << quoted(stem + ".svg") << "\n" << cmd.str();
  gp << "unset output\n";
  std::ofstream(tmp.path / "plot.gp") << gp.str();
  const std::string run = "cd " + quoted(tmp.path.string()) + " && gnuplot plot.gp > log.txt 2>&1";
  if (std::system(run.c_str()) != 0)
    throw std::runtime_error("gnuplot failed on " + stem + ": " + slurp(tmp.path / "log.txt"));
  std::map<std::string, std::string> out;
  for (const char* ext : {".png", ".svg"}) {
    const fs::path f = tmp.path / (stem + ext);
    if (!fs::exists(f)) throw std::runtime_error("gnuplot wrote no " + stem + ext);
    out[stem + ext] = slurp(f);
  }
  return out;
}

}  // namespace flapline::io
