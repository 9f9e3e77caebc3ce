// Runs a fuzz target's function on files, without libFuzzer: the regression inputs and seeds
// are replayed this way in every build, under the sanitizers in the asan preset.
//   replay-TARGET FILE|FOLDER...   (exit 0 when every input passes; a failure aborts)
#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size);

int main(int argc, char** argv) {
  namespace fs = std::filesystem;
  std::vector<fs::path> files;
  for (int k = 1; k < argc; ++k) {
    std::error_code ec;
    if (fs::is_directory(argv[k], ec)) {
      for (const auto& e : fs::recursive_directory_iterator(argv[k]))
        if (e.is_regular_file()) files.push_back(e.path());
    } else if (fs::exists(argv[k], ec)) {
      files.push_back(argv[k]);
    }
  }
  for (const fs::path& f : files) {
    std::ifstream in(f, std::ios::binary);
    const std::string bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    LLVMFuzzerTestOneInput(reinterpret_cast<const std::uint8_t*>(bytes.data()), bytes.size());
  }
  std::printf("%zu inputs replayed\n", files.size());
  return files.empty() ? 1 : 0;
}
